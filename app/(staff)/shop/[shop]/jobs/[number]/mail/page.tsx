import type { Metadata } from "next";
import { Mail } from "lucide-react";
import { MAIL_LOG_LIMIT, SENT_MAIL_KEEP_DAYS, listJobMessages } from "@/db/queries/mail-log";
import { ButtonLink, EmptyState, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { formatJobNumber, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { staffJobPage } from "@/lib/server/page-access";
import { MessageList } from "./_components/message-list";

type Props = { params: Promise<{ shop: string; number: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const n = jobNumberParamSchema.safeParse((await params).number);
  return { title: n.success ? `Mail sent · ${formatJobNumber(n.data)}` : "Mail sent" };
}

/** One job's sent log for the desk: every message queued about the job, to whom, when, and whether it went. */
export default async function JobMailPage({ params }: Props) {
  const { shop: slug, number } = await params;
  // The same people who look after the shop's failed mail (the desk and the shop owner).
  const { shop, job } = await staffJobPage(slug, number, "outbox:manage", "/mail");
  const messages = await listJobMessages({ shopId: shop.id, jobId: job.id });
  const jobPath = `/shop/${shop.slug}/jobs/${job.number}`;
  const label = formatJobNumber(job.number);
  return (
    <div className="space-y-4">
      <PageHeader
        title={`Mail sent · ${label}`}
        description={`Everything the shop sent about the ${describeMachine(job.machine)} (owner ${job.customerName}), newest first: to whom, when, and whether the mail service took it. Sent mail is kept for ${SENT_MAIL_KEEP_DAYS} days; mail that failed stays until it goes.`}
        back={{ href: jobPath, label: `Back to ${label}` }}
        actions={
          <ButtonLink href={`/shop/${shop.slug}/outbox`} variant="secondary">
            All mail that didn&apos;t go
          </ButtonLink>
        }
      />
      {messages.length === 0 ? (
        <EmptyState icon={Mail} title="Nothing sent yet" description="Updates, alerts, approval requests and invoices about this job show up here once they are queued." />
      ) : (
        <>
          <MessageList messages={messages} timeZone={shop.timezone} now={new Date()} />
          {messages.length >= MAIL_LOG_LIMIT ? <p className="text-sm text-ink-muted">The latest {MAIL_LOG_LIMIT} messages are shown.</p> : null}
        </>
      )}
    </div>
  );
}
