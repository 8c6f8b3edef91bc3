import type { Metadata } from "next";
import Link from "next/link";
import { Package } from "lucide-react";
import { Badge, EmptyState, LinkPagination, PageHeader, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { PART_STATUS_LABEL } from "@/lib/bench";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { neededPartsToOrder, partsOnOrderPage } from "@/lib/server/part-orders";
import { ActionButton } from "@/components/bench/action-form";
import { shopPageAccess } from "../shop-access";
import { receiveOrderAction } from "./actions";
import { ShopOrderForm } from "./_components/shop-order-form";

export const metadata: Metadata = { title: "Parts on order" };

type Search = Record<string, string | string[] | undefined>;

/** Parts on order or back-ordered across the shop, late ones first, for which job; paged on the server. */
export default async function PartsOnOrderPage({ params, searchParams }: { params: Promise<{ shop: string }>; searchParams: Promise<Search> }) {
  const { shop: slug } = await params;
  const { shop } = await shopPageAccess(slug, "parts:manage", `/shop/${slug}/parts`);
  const raw = (await searchParams).page;
  const asked = Number(Array.isArray(raw) ? raw[0] : raw);
  const page = Number.isInteger(asked) && asked >= 1 && asked <= 100_000 ? asked : 1;
  const [list, needed] = await Promise.all([partsOnOrderPage(shop, page), neededPartsToOrder(shop)]);
  const base = `/shop/${shop.slug}`;
  const pageHref = (n: number) => `${base}/parts?page=${n}`;

  return (
    <div className="space-y-4">
      <PageHeader title="Parts on order" description={`Parts ordered or back-ordered for the shop's jobs. Late means the expected date has passed (today is ${list.today}).`} />
      <ShopOrderForm shop={shop.slug} needed={needed.rows} more={needed.more} today={needed.today} />
      {list.rows.length === 0 ? (
        <EmptyState icon={Package} title={page > 1 ? "No more parts on order" : "Nothing on order"} description="Parts appear here once they are put on an order, from a job's bench page or the form above." />
      ) : (
        <Table label="Parts on order">
          <THead>
            <TR>
              <TH>Part</TH>
              <TH>Job</TH>
              <TH>Status</TH>
              <TH>Supplier</TH>
              <TH>Expected</TH>
              <TH>Order</TH>
            </TR>
          </THead>
          <TBody>
            {list.rows.map((r) => (
              <TR key={r.partId} data-testid="part-on-order">
                <TD>
                  <span className="font-semibold text-ink">{r.description}</span>
                  {r.partNumber ? <span className="text-ink-muted"> · {r.partNumber}</span> : null}
                </TD>
                <TD className="whitespace-nowrap">
                  <Link href={`${base}/jobs/${r.jobNumber}/bench`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
                    {formatJobNumber(r.jobNumber)}
                  </Link>
                </TD>
                <TD>
                  <Badge tone={r.status === "back_ordered" ? "brass" : "neutral"}>{PART_STATUS_LABEL[r.status]}</Badge>
                </TD>
                <TD>{[r.supplier, r.reference ? `ref. ${r.reference}` : null].filter(Boolean).join(" · ") || "—"}</TD>
                <TD className="whitespace-nowrap">
                  {r.expectedOn ?? "No date"}
                  {r.late ? (
                    <>
                      {" "}
                      <Badge tone="rust">Late</Badge>
                    </>
                  ) : null}
                </TD>
                <TD>
                  {/* Once per order on the page: receiving it marks in every part of it still on order. */}
                  {r.orderId !== null && list.rows.findIndex((x) => x.orderId === r.orderId) === list.rows.indexOf(r) ? (
                    <ActionButton action={receiveOrderAction} fields={{ shop: shop.slug, order: String(r.orderId) }} done="Received: its parts are marked in on their jobs.">
                      Order received
                    </ActionButton>
                  ) : null}
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}
      <LinkPagination page={page} hasNext={list.hasMore} href={pageHref} label={`Page ${page}`} />
    </div>
  );
}
