// Renders a tree of async server components the way Next renders a page: with React's server
// build (run under `node --conditions=react-server --import tsx`) and React's Flight renderer as
// Next vendors it, so React's `cache` is scoped to each render as it is to each request. Used by
// tests/integration/job-pages.test.ts through renderCounting() below; counts the queries each
// render sends, by what they read.
import { createRequire } from "node:module";
import { Writable } from "node:stream";
import type { ReactNode } from "react";
import { db } from "@/db/client";
import type { Actor } from "@/lib/permissions";
import { resolve } from "@/lib/server/access";
import { jobApprovals } from "@/lib/server/approval-views";
import { moneySettingsOf, shopBySlug } from "@/lib/server/request-cache";

type Input = { tree: "staff" | "owner"; actor: Actor; slug: string; number: number; publicId: string; renders: number };
export type RenderCounts = { shopBySlug: number; shopRows: number; jobReads: number; moneySettings: number; total: number; html: string };

const require = createRequire(import.meta.url);
const { renderToPipeableStream } = require("next/dist/compiled/react-server-dom-webpack/server.node") as {
  renderToPipeableStream: (model: ReactNode, manifest: object, options: { onError: (e: unknown) => void }) => { pipe: (w: Writable) => void };
};

/** What the query reads, from its SQL as Knex writes it. */
function classify(sql: string): "shopBySlug" | "jobReads" | "moneySettings" | null {
  if (/from `shops`/.test(sql) && /`slug` = \?/.test(sql)) return "shopBySlug";
  if (/from `jobs` as `j`/.test(sql)) return "jobReads";
  if (/from `shop_money_settings`/.test(sql)) return "moneySettings";
  return null;
}

function render(tree: ReactNode): Promise<string> {
  return new Promise((done, fail) => {
    const chunks: Buffer[] = [];
    renderToPipeableStream(tree, {}, { onError: fail }).pipe(
      new Writable({
        write(chunk: Buffer, _encoding, next) {
          chunks.push(chunk);
          next();
        },
        final(next) {
          next();
          done(Buffer.concat(chunks).toString());
        },
      }),
    );
  });
}

async function main() {
  const input = JSON.parse(process.argv[2]!) as Input;
  const { actor, slug, number, publicId } = input;
  // "staff": the staff shop layout (shopPageAccess → loadPage("shop")) and the job page under it
  // (staffJobPage → loadPage("shopJob")), rendered together as Next renders them; the page's
  // drop-off card and approvals panel both price with the shop's money settings, the approvals
  // panel and the clip composer take the currency and the clip limits from the shop row.
  // "owner": the owner's job page (loadPage("job")) and its shop's time zone, with two more parts
  // that find the same job by its public id.
  async function Layout({ children }: { children: ReactNode }) {
    const { shop } = await resolve(actor, "shop", { shop: slug }, "shop:view-board");
    return (
      <div data-shop={shop.slug}>
        {children}
      </div>
    );
  }
  async function Page() {
    const { job, shop } = await resolve(actor, "shopJob", { shop: slug, number: String(number) }, "journal:view-shop-only");
    return (
      <main data-job={job.number} data-tz={shop.timezone}>
        <DropoffLike shopId={shop.id} />
        <Approvals job={job} currency={shop.currency} />
        <p>{shop.clipMaxSeconds}</p>
      </main>
    );
  }
  async function DropoffLike({ shopId }: { shopId: number }) {
    const settings = await moneySettingsOf(shopId);
    return <p>{String(settings.labourRateMinor)}</p>;
  }
  async function Approvals({ job, currency }: { job: { id: number; shopId: number }; currency: string }) {
    const overview = await jobApprovals(job, currency);
    return <p>{overview.findings.length}</p>;
  }
  async function ByPublicId() {
    const { job } = await resolve(actor, "job", { job: publicId }, "job:view");
    const shop = await shopBySlug(job.shopSlug);
    return <p>{shop?.timezone}</p>;
  }

  const out: RenderCounts[] = [];
  for (let i = 0; i < input.renders; i++) {
    const counts: RenderCounts = { shopBySlug: 0, shopRows: 0, jobReads: 0, moneySettings: 0, total: 0, html: "" };
    const onQuery = (q: { sql: string }) => {
      counts.total++;
      if (/from `shops`/.test(q.sql)) counts.shopRows++;
      const kind = classify(q.sql);
      if (kind) counts[kind]++;
    };
    db().on("query", onQuery);
    try {
      counts.html = await render(
        input.tree === "staff" ? (
          <Layout>
            <Page />
          </Layout>
        ) : (
          <div>
            <ByPublicId />
            <ByPublicId />
            <ByPublicId />
          </div>
        ),
      );
    } finally {
      db().off("query", onQuery);
    }
    out.push(counts);
  }
  process.stdout.write(`${JSON.stringify(out)}\n`);
  await db().destroy();
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
