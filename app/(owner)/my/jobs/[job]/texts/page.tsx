import type { Metadata } from "next";
import { customerTextStateOf, shopTextSettingsOf } from "@/db/queries/texts";
import { Card, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { loadPage } from "@/lib/server/page-access";
import { NOTIFY_CHANNEL_LABEL, consentedNumber } from "@/lib/texts";
import { ChooseTextsForm, StopTextsButton } from "./_components/texts-forms";

export const metadata: Metadata = { title: "E-mail or texts" };

/** How consent was given or withdrawn, in the owner's own words. */
const HOW: Record<string, string> = {
  check_in: "at the shop's desk",
  owner_page: "on this page",
  start_keyword: "by texting START",
  stop_keyword: "by texting STOP",
  carrier: "with your phone company",
};

/** The owner's own choice of e-mail, text or both for this shop, and their consent to texts (issue 21). */
export default async function OwnerTextsPage({ params }: { params: Promise<{ job: string }> }) {
  const { job: publicId } = await params;
  const { job } = await loadPage("job", { job: publicId }, "texts:choose", `/my/jobs/${publicId}/texts`);
  const [state, shop] = await Promise.all([customerTextStateOf({ shopId: job.shopId, customerId: job.customerId }), shopTextSettingsOf({ shopId: job.shopId })]);
  const number = state ? consentedNumber(state) : null;
  // On the shop's clock, as every time on the owner's job pages.
  const fmt = new Intl.DateTimeFormat("en-US", { year: "numeric", month: "short", day: "numeric", hour: "numeric", minute: "2-digit", timeZone: shop?.timezone ?? "UTC", timeZoneName: "short" });
  return (
    <div className="space-y-4">
      <PageHeader
        title="E-mail or texts"
        description={`How ${job.shopName} tells you about your machines: requests for your OK, ready to collect, invoices and answers to your questions.`}
        back={{ href: `/my/jobs/${publicId}`, label: describeMachine(job.machine) }}
      />
      <Card as="section" title="What you get now" headingId="texts-now">
        <p data-testid="texts-now">
          {NOTIFY_CHANNEL_LABEL[state?.notify_channels ?? "email"]}
          {number && state?.text_consent_at && state.text_consent_how
            ? `. Texts go to ${number}; you agreed ${HOW[state.text_consent_how]} on ${fmt.format(state.text_consent_at)}.`
            : state?.text_opt_out_at && state.text_opt_out_how
              ? `. You stopped texts ${HOW[state.text_opt_out_how]} on ${fmt.format(state.text_opt_out_at)}.`
              : "."}
        </p>
        {number ? <StopTextsButton jobPublicId={publicId} /> : null}
      </Card>
      <Card as="section" title="Change it" headingId="texts-change">
        <ChooseTextsForm jobPublicId={publicId} channels={state?.notify_channels ?? "email"} phone={number ?? state?.phone ?? ""} />
      </Card>
    </div>
  );
}
