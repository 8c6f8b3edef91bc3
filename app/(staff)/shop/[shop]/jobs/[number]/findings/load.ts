import "server-only";
import { getMoneySettings, listEvidenceChoices } from "@/db/queries/findings";
import { getNamedRates } from "@/db/queries/shop-settings";
import { getMarkupRule, listPickableParts } from "@/db/queries/parts-pricing";
import { NO_MARKUP } from "@/lib/parts-pricing";
import { can } from "@/lib/permissions";
import { staffJobPage } from "@/lib/server/page-access";
import type { EditorSettings } from "./_components/form-state";

/** The job behind a findings page, for its shop's staff, with what the editor needs (no money for a technician). */
export async function loadFindingsJob(slug: string, number: string, suffix: string) {
  const { actor, shop, job, resource, mayViewMoney } = await staffJobPage(slug, number, "approvals:draft", suffix);
  const [settings, choices, named, markup, pickable] = await Promise.all([
    getMoneySettings({ shopId: shop.id }),
    listEvidenceChoices({ shopId: shop.id, jobId: job.id }),
    mayViewMoney ? getNamedRates({ shopId: shop.id }) : [],
    mayViewMoney ? getMarkupRule({ shopId: shop.id }) : NO_MARKUP,
    // Parts already on the job that a priced part line may stand for (issue 19): the desk's choice.
    mayViewMoney ? listPickableParts({ shopId: shop.id, jobId: job.id }) : [],
  ]);
  return {
    actor,
    shop,
    job,
    // A technician's editor gets no labour rate or supplies cap: a new labour line starts unpriced.
    settings: { taxable: settings.taxable, tax: settings.tax, labourRateMinor: mayViewMoney ? settings.labourRateMinor : null, supplies: mayViewMoney ? settings.supplies : null, namedRates: named, markup } satisfies EditorSettings,
    choices,
    pickable,
    basePath: `/shop/${shop.slug}/jobs/${job.number}`,
    mayPrice: can(actor, "approvals:send", resource),
    mayRecord: can(actor, "approvals:record-decision", resource),
    mayViewMoney,
  };
}
