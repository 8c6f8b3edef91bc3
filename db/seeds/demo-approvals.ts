// Demo money settings and one open approval request (J-0005 at Copper Gulch: the split CV boot the
// journal already tells of), so a fresh start shows a decision waiting at the top of the owner's
// page. All values invented. The request is frozen the way the app freezes one (lib/approvals.ts):
// snapshot, canonical JSON and its SHA-256.
import crypto from "node:crypto";
import type { Knex } from "knex";
import { type DraftLine, type Pricing, buildSnapshot, canonicalJson } from "../../lib/approvals";

// Copper Gulch taxes per line at 8.25 % (REFERENCES §5's worked rate) and allows the greater of $10
// or 10 %, capped at $50, over what was authorised (REFERENCES §6's example rule); Saltmarsh keeps
// the strict default.
const MONEY: Record<string, Record<string, unknown>> = {
  "copper-gulch": {
    labour_rate_minor: 11500,
    tax_rate_percent: "8.25",
    tax_method: "per_line",
    supplies_percent: "5",
    supplies_base: "labour",
    supplies_cap_minor: 2500,
    tolerance_kind: "greater_of",
    tolerance_fixed_minor: 1000,
    tolerance_percent: "10",
    tolerance_cap_minor: 5000,
    reminder_delay_hours: 24,
  },
  saltmarsh: { labour_rate_minor: 9500, tax_rate_percent: "6.5", tax_method: "per_invoice", reminder_delay_hours: 48 },
};

/** How a request of the shop is priced: the same settings as MONEY above. */
export const REQUEST_PRICING: Record<string, Pricing> = {
  "copper-gulch": { tax: { ratePercent: "8.25", method: "per_line" }, supplies: { percent: "5", base: "labour", capMinor: 2500, taxable: false } },
};

export const line = (l: Partial<DraftLine> & Pick<DraftLine, "kind" | "description" | "taxable">): DraftLine => ({
  partNumber: null,
  qtyThousandths: null,
  unitPriceMinor: null,
  hoursTenths: null,
  rateMinor: null,
  amountMinor: null,
  ...l,
});

const CV_FINDING = {
  title: "Front left CV axle: boot split, joint clicking",
  found: "The front left CV boot is split and the outer joint clicks at full lock. Grease has been thrown over the knuckle, so grit is already inside the joint.",
  whyItMatters: "A worn joint can let go under power and leave the machine without drive to that wheel, usually far from the trailer.",
  lines: [
    line({ kind: "part", description: "Front left CV axle assembly", partNumber: "TSR-CVA-570FL", qtyThousandths: 1000, unitPriceMinor: 18995, taxable: true }),
    line({ kind: "labour", description: "Replace the front left axle", hoursTenths: 12, rateMinor: 11500, taxable: false }),
    line({ kind: "fee", description: "Axle nut (single use) and boot clamps", amountMinor: 850, taxable: false }),
  ],
};

export async function seedApprovalsDemo(tx: Knex.Transaction, slug: string, shopId: number, byEmail: (email: string) => number | undefined) {
  const money = MONEY[slug];
  if (money) await tx("shop_money_settings").insert({ shop_id: shopId, ...money });
  if (slug !== "copper-gulch") return;

  const job = (await tx("jobs").where({ shop_id: shopId, number: 5 }).first("id", "public_id", "technician_user_id")) as { id: number; public_id: string; technician_user_id: number | null };
  const customer = (await tx("jobs as j").join("customers as c", "c.id", "j.customer_id").where("j.id", job.id).first("c.email")) as { email: string };
  const writer = byEmail("priya@coppergulch.test")!;
  // Later than every other entry of the job, so the timeline (ordered by posting) reads in time order;
  // the finding was last saved before it was sent.
  const sentAt = new Date(Date.now() - 30_000);
  const drafted = new Date(sentAt.getTime() - 10 * 60_000);
  const { publicId } = await seedSentRequest(tx, {
    shopId,
    job,
    finding: CV_FINDING,
    pricing: REQUEST_PRICING["copper-gulch"]!,
    sentTo: customer.email,
    writer,
    drafted,
    sentAt,
  });
  await tx("journal_entries").insert({
    shop_id: shopId,
    job_id: job.id,
    kind: "approval",
    visibility: "shared",
    author_user_id: writer,
    body: JSON.stringify({ event: "sent", request: publicId, title: CV_FINDING.title, version: 1, lines: CV_FINDING.lines.length, safety: "none", replaces: null }),
    created_at: sentAt,
    shared_at: sentAt,
  });
}

type SeedFinding = { title: string; found: string; whyItMatters: string; lines: DraftLine[] };

/**
 * A finding with its lines and the request sent for it, frozen the way the app freezes one
 * (lib/approvals.ts: snapshot, canonical JSON, SHA-256). `linkLines` keeps the lines' ids on the
 * request as sending does when parts are priced on them (issue 19); `answeredAt` marks it answered
 * (its decision is the caller's).
 */
export async function seedSentRequest(
  tx: Knex.Transaction,
  o: {
    shopId: number;
    job: { id: number; public_id: string; technician_user_id: number | null };
    finding: SeedFinding;
    pricing: Pricing;
    sentTo: string;
    writer: number;
    drafted: Date;
    sentAt: Date;
    answeredAt?: Date;
    linkLines?: boolean;
  },
) {
  const { shopId, job, finding } = o;
  const [findingId] = await tx("findings").insert({
    shop_id: shopId,
    job_id: job.id,
    title: finding.title,
    found: finding.found,
    why_it_matters: finding.whyItMatters,
    safety: "none",
    created_by_user_id: job.technician_user_id,
    created_at: o.drafted,
    updated_at: o.drafted,
  });
  const lineIds: number[] = [];
  for (const [position, l] of finding.lines.entries()) {
    const [id] = await tx("finding_lines").insert({
      shop_id: shopId,
      finding_id: findingId,
      position,
      kind: l.kind,
      description: l.description,
      part_number: l.partNumber,
      qty_thousandths: l.qtyThousandths,
      unit_price_minor: l.unitPriceMinor,
      hours_tenths: l.hoursTenths,
      rate_minor: l.rateMinor,
      amount_minor: l.amountMinor,
      taxable: l.taxable,
    });
    lineIds.push(Number(id));
  }
  const publicId = crypto.randomBytes(12).toString("base64url");
  const snapshot = buildSnapshot({
    request: publicId,
    job: job.public_id,
    version: 1,
    currency: "USD",
    finding: { title: finding.title, found: finding.found, whyItMatters: finding.whyItMatters, safety: "none" },
    evidence: [],
    lines: finding.lines,
    pricing: o.pricing,
  });
  const canonical = canonicalJson(snapshot);
  const sha = (text: string) => crypto.createHash("sha256").update(text, "utf8").digest("hex");
  const hash = sha(canonical);
  const [requestId] = await tx("approval_requests").insert({
    public_id: publicId,
    shop_id: shopId,
    job_id: job.id,
    finding_id: findingId,
    version: 1,
    ...(o.answeredAt ? { status: "answered", answered_at: o.answeredAt } : {}),
    snapshot: JSON.stringify(snapshot),
    canonical,
    hash,
    token_hash: sha(crypto.randomBytes(32).toString("base64url")),
    currency: "USD",
    estimate_pre_tax_minor: snapshot.totals.preTaxTotalMinor,
    estimate_tax_minor: snapshot.totals.taxMinor,
    estimate_total_minor: snapshot.totals.totalMinor,
    sent_to: o.sentTo,
    sent_by_user_id: o.writer,
    sent_at: o.sentAt,
    ...(o.linkLines ? { line_ids: JSON.stringify(lineIds) } : {}),
  });
  return { findingId: Number(findingId), lineIds, requestId: Number(requestId), publicId, snapshot, hash };
}
