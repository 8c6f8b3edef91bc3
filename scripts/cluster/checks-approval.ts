// 50 concurrent answers to one approval request, through HAProxy over both instances: exactly one
// decision. The request is made the way the desk makes one (check-in, finding, prices, send) and
// answered by the machine's owner, signed in through a one-time link minted as the app mints it.
import crypto from "node:crypto";
import { type Check, type Ctx, checkIn } from "./checks-app";
import { action, call } from "./http";

const OWNER = "ruth.calloway@mail.test";

/** The owner's session: a sign-in link row (SHA-256 of token + AUTH_SECRET, lib/server/sign-in.ts), then the link form. */
async function signInOwner(ctx: Ctx): Promise<string> {
  const token = crypto.randomBytes(32).toString("base64url");
  const tokenHash = crypto.createHash("sha256").update(`${token}${process.env.AUTH_SECRET}`).digest("hex");
  await ctx.k("sign_in_links").insert({ email: OWNER, token_hash: tokenHash, expires_at: ctx.k.raw("NOW() + INTERVAL 20 MINUTE") });
  const answer = await action("app/(auth)/sign-in/actions.ts#signInWithLink", "/sign-in/link", { token });
  const cookie = answer.cookies.filter((c) => c.includes("session-token") && !c.endsWith("=")).join("; ");
  if (!cookie) throw new Error(`the owner's sign-in link set no session cookie (HTTP ${answer.status}, ${answer.message ?? answer.text.slice(0, 160)})`);
  return cookie;
}

const json = () => ({ "content-type": "application/json", origin: process.env.APP_URL! });

async function post(path: string, cookie: string, body: unknown, method = "POST") {
  const answer = await call(path, { method, cookie, headers: json(), body: JSON.stringify(body) });
  if (answer.status !== 200) throw new Error(`${method} ${path}: HTTP ${answer.status} ${answer.text.slice(0, 200)}`);
  return JSON.parse(answer.text) as Record<string, unknown>;
}

export async function oneDecisionFromManyAnswers(ctx: Ctx, count = 50): Promise<Check> {
  const name = `${count} concurrent answers to one approval request give one decision`;
  const machine = await ctx.k("machines as m").join("customers as c", "c.id", "m.customer_id").where({ "m.shop_id": ctx.shop.id, "c.email": OWNER }).first("m.id", "m.customer_id");
  if (!machine) throw new Error(`no machine of ${OWNER} in the demo shop`);
  const { number, answer: checkedIn } = await checkIn(ctx, { customerId: Number(machine.customer_id), machineId: Number(machine.id) }, "Cluster check: approval race");
  if (number == null) throw new Error(`check-in refused: HTTP ${checkedIn.status} ${checkedIn.message ?? ""}`);
  const job = String((await ctx.k("jobs").where({ shop_id: ctx.shop.id, number }).first("public_id"))!.public_id);
  const finding = { title: "Drive chain worn", found: "Chain stretched past the adjuster's range.", safety: "none" };
  const made = await post(`/api/jobs/${job}/findings`, ctx.staff.cookie, finding);
  const lines = [{ kind: "part", description: "Drive chain", partNumber: null, qty: "1", unitPrice: "54.00" }];
  const saved = await post(`/api/jobs/${job}/findings/${made.id}`, ctx.staff.cookie, { ...finding, version: made.version, lines }, "PATCH");
  const sent = (await post(`/api/jobs/${job}/findings/${made.id}/send`, ctx.staff.cookie, { findingVersion: saved.version })) as { request: string; hash: string };
  const owner = await signInOwner(ctx);
  const answers = await Promise.all(
    Array.from({ length: count }, (_, i) => {
      const body = { shownHash: sent.hash, lines: [{ no: 1, answer: i % 2 ? "approved" : "declined" }], signature: "Ruth Calloway", wantsPartsBack: false, confirmed: true };
      return call(`/api/approvals/${sent.request}/decision`, { method: "POST", cookie: owner, headers: json(), body: JSON.stringify(body) });
    }),
  );
  const request = await ctx.k("approval_requests").where({ shop_id: ctx.shop.id, public_id: sent.request }).first("id", "status");
  const decisions = await ctx.k("approval_decisions").where({ shop_id: ctx.shop.id, request_id: request!.id }).count({ n: "*" });
  const statuses = answers.reduce<Record<string, number>>((m, a) => ({ ...m, [a.status]: (m[a.status] ?? 0) + 1 }), {});
  const instances = new Set(answers.map((a) => a.instance));
  const ok = answers.filter((a) => a.status === 200).length;
  const stored = Number(decisions[0]!.n);
  const serverErrors = answers.filter((a) => a.status >= 500).length;
  return {
    name,
    pass: ok === 1 && stored === 1 && serverErrors === 0,
    detail: `request ${sent.request} on job ${number}; answers by status ${JSON.stringify(statuses)} over instances ${[...instances].sort().join(", ")}; ${stored} decision stored, request ${request!.status}`,
  };
}
