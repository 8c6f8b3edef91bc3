import { NextResponse } from "next/server";
import { pingDatabase } from "@/db/queries/health";
import { route } from "@/lib/route";

export const dynamic = "force-dynamic";

async function check(name: string, probe: () => Promise<unknown>): Promise<[string, string]> {
  try {
    await Promise.race([probe(), new Promise((_, reject) => setTimeout(() => reject(new Error("timed out")), 2000))]);
    return [name, "ok"];
  } catch (error) {
    return [name, `down: ${error instanceof Error ? error.message : "unknown"}`];
  }
}

/** Liveness for load balancers and `npm start`: 200 when every dependency answers, else 503 naming what is down. */
export const GET = route({ permission: "public" }, async () => {
  const checks = Object.fromEntries(
    await Promise.all([
      check("db", pingDatabase),
      check("mail", async () => {
        const base = process.env.RESEND_BASE_URL;
        // The hosted API is not probed on every health check; the local fake is.
        if (!base || !/127\.0\.0\.1|localhost/.test(base)) return;
        const res = await fetch(`${base}/_fake/stats`, { signal: AbortSignal.timeout(2000) });
        if (!res.ok) throw new Error(`HTTP ${res.status}`);
      }),
    ]),
  );
  const down = Object.entries(checks).filter(([, v]) => v !== "ok").map(([k]) => k);
  return NextResponse.json({ ...checks, ...(down.length ? { down } : {}) }, { status: down.length ? 503 : 200 });
});
