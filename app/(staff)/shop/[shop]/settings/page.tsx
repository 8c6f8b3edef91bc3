import type { Metadata } from "next";
import Link from "next/link";
import type { ReactNode } from "react";
import { Card, PageHeader } from "@/components/ui";
import { getBenchSettings } from "@/db/queries/bench";
import { getClipLimits } from "@/db/queries/clips";
import { minorToInput, timeZoneChoices, toleranceChoice, trimPercent } from "@/lib/shop-settings";
import { SECTION_LABEL, type SettingSection, settingsPageData } from "@/lib/server/shop-settings";
import { shopPageAccess } from "../shop-access";
import { SettingsForm as BenchSettingsForm } from "../specs/_components/settings-form";
import { DropoffTermsForm, LabourForm, SuppliesForm, TaxForm, ToleranceForm } from "./_components/money-forms";
import { DigestForm, HoursForm, ProfileForm, RegionForm } from "./_components/profile-forms";
import { MarkupForm } from "./_components/markup-form";
import { getMarkupRule } from "@/db/queries/parts-pricing";
import { markupFormValues } from "@/lib/server/part-pricing";
import { shopTextSettingsOf } from "@/db/queries/texts";
import { smsConfig } from "@/lib/server/config";
import { DEFAULT_QUIET, clockText, shopLanguages } from "@/lib/texts";
import { TextsForm } from "./_components/texts-form";

export const metadata: Metadata = { title: "Shop settings" };

const when = (iso: string, timeZone: string) => new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeStyle: "short", timeZone }).format(new Date(iso));

/** The shop owner's settings, one form per section, with the newest changes (who and when) at the end. */
export default async function SettingsPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { shop } = await shopPageAccess(slug, "shop:manage-settings", `/shop/${slug}/settings`);
  const [{ row, money, named, dropoff, changes }, bench, clipLimits, markup, texts] = await Promise.all([
    settingsPageData(shop.id),
    getBenchSettings({ shopId: shop.id }),
    getClipLimits({ shopId: shop.id }),
    getMarkupRule({ shopId: shop.id }),
    shopTextSettingsOf({ shopId: shop.id }),
  ]);
  const c = row.currency;
  const t = money.tolerance;
  const own = (kind: "labour" | "fee" | "supplies") => (money.tax.kindRates?.[kind] != null ? trimPercent(money.tax.kindRates[kind]!) : "");
  const section = (id: string, title: string, description: string | null, children: ReactNode) => (
    <Card as="section" title={title} headingId={id} description={description ?? undefined}>
      {children}
    </Card>
  );

  return (
    <div className="space-y-6">
      <PageHeader
        title="Shop settings"
        description="Changes apply to new estimates and invoices. Approval requests already sent and invoices already issued keep the prices, tax and rules they were made with."
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
      />
      {section("settings-profile", "Profile and contact", null, <ProfileForm shopSlug={shop.slug} profile={{ name: row.name, email: row.email, phone: row.phone, address: row.address }} />)}
      {section("settings-hours", "Opening hours", "On the shop's clock.", <HoursForm shopSlug={shop.slug} hours={row.openingHours} />)}
      {section("settings-region", "Time zone and currency", null, <RegionForm shopSlug={shop.slug} timezone={row.timezone} currency={c} zones={timeZoneChoices()} />)}
      {section(
        "settings-labour",
        "Labour rates",
        null,
        <LabourForm shopSlug={shop.slug} currency={c} defaultRate={minorToInput(money.labourRateMinor, c)} named={named.map((r) => ({ name: r.name, rate: minorToInput(r.rateMinor, c) }))} />,
      )}
      {section("settings-tax", "Tax", null, <TaxForm shopSlug={shop.slug} tax={{ method: money.tax.method, rate: trimPercent(money.tax.ratePercent), kindRates: { labour: own("labour"), fee: own("fee"), supplies: own("supplies") }, taxable: money.taxable }} />)}
      {section(
        "settings-supplies",
        "Shop-supplies fee",
        "A percent of labour (or parts and labour) for consumables, with an optional cap.",
        <SuppliesForm
          shopSlug={shop.slug}
          currency={c}
          supplies={{ percent: money.supplies ? trimPercent(money.supplies.percent) : "", base: money.supplies?.base ?? "labour", cap: minorToInput(money.supplies?.capMinor, c), taxable: money.supplies?.taxable ?? false }}
        />,
      )}
      {section(
        "settings-markup",
        "Parts markup",
        "The sell price a part line starts at when the desk types its cost. The owner only ever sees the sell price.",
        <MarkupForm shopSlug={shop.slug} currency={c} markup={markupFormValues(markup, c)} />,
      )}
      {section(
        "settings-tolerance",
        "Over-estimate tolerance",
        "How far a charge may go past what the owner authorised before the invoice flags it for a new approval.",
        <ToleranceForm
          shopSlug={shop.slug}
          currency={c}
          tolerance={{
            choice: toleranceChoice(t, c),
            percent: t.kind === "greater_of" ? trimPercent(t.percent) : "",
            fixed: t.kind === "greater_of" ? minorToInput(t.fixedMinor, c) : "",
            cap: t.kind === "greater_of" ? minorToInput(t.capMinor, c) : "",
          }}
        />,
      )}
      {section(
        "settings-dropoff",
        "Standard drop-off terms",
        "What anyone at the counter, technicians included, can put in front of an owner to sign at check-in. Empty both: the desk types the terms for each job.",
        <DropoffTermsForm shopSlug={shop.slug} currency={c} terms={{ charge: dropoff ? minorToInput(dropoff.chargeMinor, c) : "", upTo: dropoff ? minorToInput(dropoff.upToMinor, c) : "" }} />,
      )}
      {section("settings-digest", "Update digest", null, <DigestForm shopSlug={shop.slug} minutes={row.digestWindowMinutes} />)}
      {section(
        "settings-texts",
        "Text messages",
        `Texts go only to owners who agreed. Quiet hours default to ${clockText(DEFAULT_QUIET.start)}–${clockText(DEFAULT_QUIET.end)}, the hours US rules set for marketing calls (47 CFR § 64.1200(c)(1)); keeping service texts to them is common carrier practice.`,
        <TextsForm shopSlug={shop.slug} texts={{ smsFrom: texts?.sms_from ?? "", quietStart: clockText(texts?.sms_quiet_start ?? DEFAULT_QUIET.start), quietEnd: clockText(texts?.sms_quiet_end ?? DEFAULT_QUIET.end), defaultFrom: smsConfig()?.defaultFrom ?? null, languages: shopLanguages({ sms_languages: texts?.sms_languages }) }} />,
      )}
      {section(
        "bench-settings",
        "Bench, clip and board settings",
        null,
        <BenchSettingsForm shopSlug={shop.slug} currency={shop.currency} settings={bench} clipLimits={clipLimits} ownerWaitDays={shop.ownerWaitDays} />,
      )}
      {section(
        "settings-more",
        "Elsewhere",
        null,
        <ul className="list-disc space-y-1 pl-5">
          <li>
            <Link className="font-semibold text-oil underline" href={`/shop/${shop.slug}/specs`}>
              Shop specs
            </Link>
            : torque specs, limits and capacities per model.
          </li>
          <li>
            <Link className="font-semibold text-oil underline" href={`/shop/${shop.slug}/portfolio`}>
              Portfolio
            </Link>
            : the shop&apos;s public profile and its stories.
          </li>
        </ul>,
      )}
      {section(
        "settings-history",
        "Recent changes",
        null,
        changes.length ? (
          <ul className="space-y-1">
            {changes.map((ch) => (
              <li key={ch.id}>
                <span className="font-semibold">{SECTION_LABEL[ch.section as SettingSection] ?? ch.section}</span> changed by {ch.by ?? "a former member of staff"},{" "}
                <time dateTime={ch.at}>{when(ch.at, row.timezone)}</time>
              </li>
            ))}
          </ul>
        ) : (
          <p>No changes recorded yet.</p>
        ),
      )}
    </div>
  );
}
