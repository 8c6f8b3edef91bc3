import type { Metadata } from "next";
import { listJobs } from "@/db/queries/jobs";
import { listShopTechnicians } from "@/db/queries/shops";
import { readFirstRun } from "@/db/queries/shop-signup";
import { ClipboardPlus } from "lucide-react";
import { Alert, ButtonLink, PageHeader } from "@/components/ui";
import { shopToday, toBoardRow } from "@/lib/jobs-view";
import { can } from "@/lib/permissions";
import { jobListQuerySchema } from "@/lib/schemas/jobs";
import { searchParamsObject } from "@/lib/route";
import { shopPageAccess } from "../shop-access";
import { FirstRunChecklist } from "./_components/first-run";
import { JobBoard } from "./_components/job-board";

export const metadata: Metadata = { title: "Jobs" };

type Props = { params: Promise<{ shop: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function JobBoardPage({ params, searchParams }: Props) {
  const { shop: slug } = await params;
  const { actor, shop } = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}`);
  const raw = new URLSearchParams();
  for (const [k, v] of Object.entries(await searchParams)) for (const one of [v ?? []].flat()) raw.append(k, one);
  const parsed = jobListQuerySchema.safeParse(searchParamsObject(raw));
  const query = parsed.success ? parsed.data : jobListQuerySchema.parse({});
  // "Today" in the shop's own time zone decides what is overdue.
  const today = shopToday(shop.timezone);
  const [page, technicians] = await Promise.all([listJobs({ shopId: shop.id, query, today }), listShopTechnicians({ shopId: shop.id })]);
  const checkInHref = can(actor, "job:check-in", { shopId: shop.id }) ? `/shop/${shop.slug}/jobs/new` : null;
  // Owners see the first-run checklist until its steps are done.
  const firstRun = can(actor, "shop:manage-settings", { shopId: shop.id }) ? await readFirstRun({ shopId: shop.id }) : null;
  const showFirstRun = firstRun && !(firstRun.labourRate && firstRun.staff && firstRun.firstJob);

  return (
    <div className="space-y-4">
      <PageHeader
        title="Jobs"
        description={`${shop.name} · every machine in the shop and where it stands`}
        actions={
          checkInHref ? (
            <ButtonLink href={checkInHref} size="lg" icon={<ClipboardPlus aria-hidden className="size-5" />}>
              Check in a machine
            </ButtonLink>
          ) : null
        }
      />
      {showFirstRun ? <FirstRunChecklist shopSlug={shop.slug} done={firstRun} /> : null}
      {parsed.success ? null : <Alert tone="warning">Some filters in the address were not understood and were reset.</Alert>}
      <JobBoard
        shopSlug={shop.slug}
        today={today}
        technicians={technicians}
        initialQuery={query}
        initialData={{ ...page, rows: page.rows.map(toBoardRow) }}
      />
    </div>
  );
}
