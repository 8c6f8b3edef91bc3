import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { Actor } from "@/lib/permissions";
import { resolve } from "@/lib/server/access";
import { connectTestDatabase, testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import type { RenderCounts } from "../support/rsc-render";

// The job pages read each row once per request: the staff layout and the job page under it
// share React's request cache (lib/server/request-cache.ts), and so do a page's cards. Checked
// by rendering with React's server build and Flight renderer (tests/support/rsc-render.tsx, in a
// child process: Vitest itself loads React's client build, whose `cache` keeps nothing).

const run = promisify(execFile);

async function renderCounting(input: { tree: "staff" | "owner"; actor: Actor; slug: string; number: number; publicId: string; renders: number }): Promise<RenderCounts[]> {
  const root = path.resolve(__dirname, "../..");
  const { stdout } = await run(process.execPath, ["--conditions=react-server", "--import", "tsx", "tests/support/rsc-render.tsx", JSON.stringify(input)], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: connectTestDatabase(), NODE_ENV: "production" },
    timeout: 80_000,
  });
  return JSON.parse(stdout.trim().split("\n").at(-1)!) as RenderCounts[];
}

describe("job pages: one read of each row per request", () => {
  let k: Knex;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let actor: Actor;
  let number: number;
  let publicId: string;

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "job-pages", roles: ["service_writer"] });
    const { jobIds } = await makeCustomerWithJobs(k, shop.id, { name: "Oda Brannock", statuses: ["inspecting"] });
    const row = (await k("jobs").where({ id: jobIds[0]! }).first("number", "public_id"))!;
    number = Number(row.number);
    publicId = String(row.public_id);
    const writer = shop.staff.service_writer!;
    actor = { userId: writer.id, email: writer.email, name: "Desk", memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role: "service_writer" }] };
  });
  afterAll(async () => k?.destroy());

  it("the staff layout and job page look the shop up once and read the job once, per request", async () => {
    const renders = await renderCounting({ tree: "staff", actor, slug: shop.slug, number, publicId, renders: 2 });
    expect(renders).toHaveLength(2);
    for (const r of renders) {
      expect(r.html).toContain(`"data-job":${number}`);
      // One read of the shop's row in all (its clip limits and currency come with it).
      expect({ shopBySlug: r.shopBySlug, shopRows: r.shopRows, jobReads: r.jobReads, moneySettings: r.moneySettings }).toEqual({ shopBySlug: 1, shopRows: 1, jobReads: 1, moneySettings: 1 });
    }
    // The second request read afresh: nothing was kept between them.
    expect(renders[1]!.total).toBe(renders[0]!.total);
  }, 90_000); // a child process that compiles the modules it renders

  it("parts of a page that find the job by its public id share one read", async () => {
    const renders = await renderCounting({ tree: "owner", actor, slug: shop.slug, number, publicId, renders: 2 });
    for (const r of renders) expect({ shopBySlug: r.shopBySlug, jobReads: r.jobReads }).toEqual({ shopBySlug: 1, jobReads: 1 });
  }, 90_000);

  it("outside a render (handlers, actions) every call reads: nothing outlives a write", async () => {
    let shopReads = 0;
    const count = (q: { sql: string }) => {
      if (/from `shops`/.test(q.sql) && /`slug` = \?/.test(q.sql)) shopReads++;
    };
    db().on("query", count);
    try {
      await resolve(actor, "shop", { shop: shop.slug }, "shop:view-board");
      await resolve(actor, "shopJob", { shop: shop.slug, number: String(number) }, "journal:view-shop-only");
    } finally {
      db().off("query", count);
    }
    expect(shopReads).toBe(2);
  });
});
