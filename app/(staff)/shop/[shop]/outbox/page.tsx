import type { Metadata } from "next";
import Link from "next/link";
import { CircleX, MailCheck, RotateCw } from "lucide-react";
import { listOutboxProblems } from "@/db/queries/outbox";
import { Badge, EmptyState, PageHeader, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { shopPageAccess } from "../shop-access";
import { RetryButton } from "./retry-button";

export const metadata: Metadata = { title: "E-mail that didn't go" };

/** The shop's e-mail that failed to send: still being retried, or given up on after the last try. */
export default async function OutboxPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { shop } = await shopPageAccess(slug, "outbox:manage", `/shop/${slug}/outbox`);
  const problems = await listOutboxProblems({ shopId: shop.id });
  const when = new Intl.DateTimeFormat("en-US", { timeZone: shop.timezone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" });
  return (
    <div className="space-y-4">
      <PageHeader
        title="E-mail that didn't go"
        description="Updates and alerts the mail service refused or couldn't take. Mail being retried goes again by itself; mail given up on waits for you."
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
      />
      {problems.length === 0 ? (
        <EmptyState icon={MailCheck} title="Nothing waiting" description="Every e-mail this shop queued has gone out. Failed mail shows up here with a button to send it again." />
      ) : (
        <Table label="E-mail that didn't go">
          <THead>
            <TR>
              <TH>Queued</TH>
              <TH>To</TH>
              <TH>Job</TH>
              <TH>Subject</TH>
              <TH>State</TH>
              <TH>Last error</TH>
              <TH>
                <span className="sr-only">Action</span>
              </TH>
            </TR>
          </THead>
          <TBody>
            {problems.map((p) => (
              <TR key={p.id}>
                <TD className="whitespace-nowrap">{when.format(p.createdAt)}</TD>
                <TD className="break-all">{p.to}</TD>
                <TD className="whitespace-nowrap">
                  {/* The job's sent log: everything else sent about it, to whom and when. */}
                  {p.jobNumber != null ? (
                    <Link href={`/shop/${shop.slug}/jobs/${p.jobNumber}/mail`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
                      {formatJobNumber(p.jobNumber)}
                      <span className="sr-only">: mail sent about this job</span>
                    </Link>
                  ) : (
                    "—"
                  )}
                </TD>
                <TD>{p.subject}</TD>
                <TD>
                  {p.state === "dead" ? (
                    <Badge tone="rust" icon={CircleX}>
                      Gave up after {p.attempts} tries
                    </Badge>
                  ) : (
                    <Badge tone="signal" icon={RotateCw}>
                      Retrying ({p.attempts} tries so far)
                    </Badge>
                  )}
                </TD>
                <TD className="text-sm text-ink-muted">{p.lastError ?? "—"}</TD>
                <TD>
                  <RetryButton shop={shop.slug} id={p.id} />
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}
    </div>
  );
}
