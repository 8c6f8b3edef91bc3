import type { Metadata } from "next";
import { BookOpen } from "lucide-react";
import Link from "next/link";
import { Card, EmptyState, PageHeader, Table, TBody, TD, TH, THead, TR } from "@/components/ui";
import { getBenchSettings } from "@/db/queries/bench";
import { type SpecRow, listShopMachineModels, listSpecs } from "@/db/queries/bench-specs";
import { SPEC_KIND_LABEL, torqueText } from "@/lib/bench";
import { atResolution, readingLimitText } from "@/lib/reading-text";
import { can } from "@/lib/permissions";
import { type TorqueUnit, isTorqueUnit } from "@/lib/torque";
import { shopPageAccess } from "../shop-access";
import { DeleteSpecButton } from "./_components/delete-spec-button";
import { SpecForm } from "./_components/spec-form";

export const metadata: Metadata = { title: "Shop specs" };

function specValue(s: SpecRow, shopUnit: TorqueUnit): string {
  if (s.kind === "torque" && s.value != null && s.unit && isTorqueUnit(s.unit)) {
    const shown = torqueText(s.value, s.unit, shopUnit);
    const pattern = s.boltCount ? `, ${s.boltCount} bolts` : "";
    return s.unit === shopUnit ? `${shown}${pattern}` : `${shown} (spec ${torqueText(s.value, s.unit)})${pattern}`;
  }
  // At the resolution typed ("0.10" stays 0.10); entries from before migration 32 as before.
  if (s.kind === "limit") return readingLimitText(s) ?? "";
  if (s.value != null) return `${atResolution(s.value, s.decimals.value)}${s.unit ? ` ${s.unit}` : ""}`;
  return "";
}

/** The shop's own specs per make and model. Everyone on staff reads them; the desk keeps them. */
export default async function SpecsPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { actor, shop } = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}/specs`);
  const [specs, settings, models] = await Promise.all([listSpecs({ shopId: shop.id }), getBenchSettings({ shopId: shop.id }), listShopMachineModels({ shopId: shop.id })]);
  const mayManage = can(actor, "specs:manage", { shopId: shop.id });
  const groups = new Map<string, SpecRow[]>();
  for (const s of specs) {
    const key = `${s.make} ${s.model}`;
    groups.set(key, [...(groups.get(key) ?? []), s]);
  }

  return (
    <div className="space-y-6">
      <PageHeader
        title="Shop specs"
        description="Torque specs, service limits, capacities and notes the shop took from its manuals, per model. The bench pre-fills from them; the maker's manual always has the last word."
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
      />
      {groups.size === 0 ? (
        <EmptyState icon={BookOpen} title="No specs yet" description={mayManage ? "Add the specs you look up most, with the manual page they came from." : "Ask the service desk to add the specs you look up most."} />
      ) : (
        [...groups.entries()].map(([model, rows], i) => (
          <Card key={model} as="section" title={model} headingId={`model-${i}`}>
            <Table label={`Specs for ${model}`}>
              <THead>
                <TR>
                  <TH>Kind</TH>
                  <TH>For</TH>
                  <TH>Value</TH>
                  <TH>Source</TH>
                  {mayManage ? <TH>Change</TH> : null}
                </TR>
              </THead>
              <TBody>
                {rows.map((s) => (
                  <TR key={s.id}>
                    <TD>{SPEC_KIND_LABEL[s.kind]}</TD>
                    <TD>
                      {s.label}
                      {s.notes ? <span className="block text-sm text-ink-muted">{s.notes}</span> : null}
                    </TD>
                    <TD>{specValue(s, settings.torqueUnit)}</TD>
                    <TD>{s.source ?? "Not given"}</TD>
                    {mayManage ? (
                      <TD>
                        <DeleteSpecButton shopSlug={shop.slug} specId={s.id} label={`${s.label} (${model})`} />
                      </TD>
                    ) : null}
                  </TR>
                ))}
              </TBody>
            </Table>
          </Card>
        ))
      )}
      {mayManage ? (
        <Card as="section" title="Add a spec" headingId="add-spec" description="Type it from the maker's manual and note the page. We ship no maker's data.">
          <SpecForm shopSlug={shop.slug} models={models} />
        </Card>
      ) : null}
      {can(actor, "shop:manage-settings", { shopId: shop.id }) ? (
        <p>
          The torque unit, pass schedule, chain limit and clip limits are in the{" "}
          <Link className="font-semibold text-oil underline" href={`/shop/${shop.slug}/settings#bench-settings`}>
            shop settings
          </Link>
          .
        </p>
      ) : null}
    </div>
  );
}
