import "server-only";
import type { Knex } from "knex";
import type { ChainSnapshot, ReadingDecimals } from "@/lib/bench";
import { AppError } from "@/lib/errors";
import { DEFAULT_MONEY_SETTINGS, type DraftLine, type EvidenceKind, type SafetyCategory, type ShopMoneySettings } from "@/lib/approvals";
import type { TaxSetting } from "@/lib/money";
import type { ReadingVerdict } from "@/lib/readings";
import { type TimelinePhoto, photoUrl } from "@/lib/journal";
import type { ClipMoment } from "@/lib/clips";
import { db } from "@/db/client";
import type { ClipMomentsTable, ClipsTable, FindingLinesTable, FindingsTable, JournalEntriesTable, PhotosTable, ReadingsTable, ShopMoneySettingsTable } from "@/db/tables";
import { transaction } from "@/db/transaction";

// Shop money settings and findings (the staff's drafts behind approval requests) with their
// evidence and lines. A finding is read with its children in three queries whatever their count.

type JobKey = { shopId: number; jobId: number };
const num = (v: unknown) => (v == null ? null : Number(v));
const iso = (v: unknown) => (v == null ? null : (v as Date).toISOString());

const TAX_KINDS = ["labour", "fee", "supplies"] as const;
type TaxKind = (typeof TAX_KINDS)[number];

/** kindRates only when a kind has a rate of its own, so snapshots of one-rate shops seal as before. */
function withKindRates(tax: TaxSetting, row: Record<`${TaxKind}_tax_text`, string | null>): TaxSetting {
  const own = TAX_KINDS.filter((kind) => row[`${kind}_tax_text`] != null);
  return own.length ? { ...tax, kindRates: Object.fromEntries(own.map((kind) => [kind, String(row[`${kind}_tax_text`])])) } : tax;
}

export async function getMoneySettings({ shopId }: { shopId: number }, k: Knex = db()): Promise<ShopMoneySettings> {
  // DECIMAL columns come back as exact text, never through a float.
  const row: (ShopMoneySettingsTable & { tax_text: string; supplies_text: string | null; tolerance_text: string } & Record<`${TaxKind}_tax_text`, string | null>) | undefined = await k("shop_money_settings")
    .where({ shop_id: shopId })
    .first(
      "*",
      k.raw("CAST(tax_rate_percent AS CHAR) AS tax_text"),
      k.raw("CAST(supplies_percent AS CHAR) AS supplies_text"),
      k.raw("CAST(tolerance_percent AS CHAR) AS tolerance_text"),
      ...TAX_KINDS.map((kind) => k.raw(`CAST(${kind}_tax_rate_percent AS CHAR) AS ${kind}_tax_text`)),
    );
  if (!row) return DEFAULT_MONEY_SETTINGS;
  return {
    labourRateMinor: num(row.labour_rate_minor),
    tax: withKindRates({ ratePercent: String(row.tax_text), method: row.tax_method }, row),
    taxable: { part: Boolean(row.parts_taxable), labour: Boolean(row.labour_taxable), fee: Boolean(row.fees_taxable) },
    supplies:
      row.supplies_text == null
        ? null
        : { percent: String(row.supplies_text), base: row.supplies_base, capMinor: num(row.supplies_cap_minor), taxable: Boolean(row.supplies_taxable) },
    tolerance:
      row.tolerance_kind === "greater_of"
        ? { kind: "greater_of", fixedMinor: Number(row.tolerance_fixed_minor), percent: String(row.tolerance_text), capMinor: num(row.tolerance_cap_minor) }
        : { kind: "strict" },
    reminderDelayHours: Number(row.reminder_delay_hours),
  };
}

export async function saveMoneySettings({ shopId, settings }: { shopId: number; settings: ShopMoneySettings }, k: Knex = db()): Promise<void> {
  const t = settings.tolerance;
  const row = {
    labour_rate_minor: settings.labourRateMinor,
    tax_rate_percent: settings.tax.ratePercent,
    tax_method: settings.tax.method,
    labour_tax_rate_percent: settings.tax.kindRates?.labour ?? null,
    fee_tax_rate_percent: settings.tax.kindRates?.fee ?? null,
    supplies_tax_rate_percent: settings.tax.kindRates?.supplies ?? null,
    parts_taxable: settings.taxable.part,
    labour_taxable: settings.taxable.labour,
    fees_taxable: settings.taxable.fee,
    supplies_percent: settings.supplies?.percent ?? null,
    supplies_base: settings.supplies?.base ?? "labour",
    supplies_cap_minor: settings.supplies?.capMinor ?? null,
    supplies_taxable: settings.supplies?.taxable ?? false,
    tolerance_kind: t.kind,
    tolerance_fixed_minor: t.kind === "greater_of" ? t.fixedMinor : 0,
    tolerance_percent: t.kind === "greater_of" ? t.percent : "0",
    tolerance_cap_minor: t.kind === "greater_of" ? (t.capMinor ?? null) : null,
    reminder_delay_hours: settings.reminderDelayHours,
    updated_at: k.fn.now(),
  };
  await k("shop_money_settings").insert({ shop_id: shopId, ...row }).onConflict("shop_id").merge(row);
}

export type StoredEvidence = { kind: EvidenceKind; ref: string; momentMs: number | null };
export type StoredLine = DraftLine & { id: number };
export type FindingRow = {
  id: number;
  shopId: number;
  jobId: number;
  title: string;
  found: string;
  whyItMatters: string | null;
  safety: SafetyCategory;
  version: number;
  createdBy: string | null;
  createdAt: string;
  updatedAt: string;
  evidence: StoredEvidence[];
  lines: StoredLine[];
};

function toLine(r: FindingLinesTable): StoredLine {
  return {
    id: Number(r.id),
    kind: r.kind,
    description: String(r.description),
    partNumber: r.part_number ?? null,
    qtyThousandths: num(r.qty_thousandths),
    unitPriceMinor: num(r.unit_price_minor),
    hoursTenths: num(r.hours_tenths),
    rateMinor: num(r.rate_minor),
    amountMinor: num(r.amount_minor),
    taxable: Boolean(r.taxable),
  };
}

/** A job's findings (or one of them) with evidence and lines, oldest first. */
export async function listFindings({ shopId, jobId, id }: JobKey & { id?: number }, k: Knex = db()): Promise<FindingRow[]> {
  const q = k("findings as f").leftJoin("users as u", "u.id", "f.created_by_user_id").where({ "f.shop_id": shopId, "f.job_id": jobId }).orderBy("f.id").select("f.*", "u.name as by_name");
  if (id != null) q.where("f.id", id);
  const rows: (FindingsTable & { by_name: string | null })[] = await q;
  if (!rows.length) return [];
  const ids = rows.map((r) => Number(r.id));
  const [evidence, lines] = await Promise.all([
    k("finding_evidence").where("shop_id", shopId).whereIn("finding_id", ids).orderBy(["finding_id", "position"]),
    k("finding_lines").where("shop_id", shopId).whereIn("finding_id", ids).orderBy(["finding_id", "position"]),
  ]);
  return rows.map((r) => {
    const fid = Number(r.id);
    return {
      id: fid,
      shopId,
      jobId,
      title: String(r.title),
      found: String(r.found),
      whyItMatters: r.why_it_matters ?? null,
      safety: r.safety,
      version: Number(r.version),
      createdBy: r.by_name ?? null,
      createdAt: iso(r.created_at)!,
      updatedAt: iso(r.updated_at)!,
      evidence: evidence.filter((e) => Number(e.finding_id) === fid).map((e) => ({ kind: e.kind, ref: String(e.ref), momentMs: num(e.moment_ms) })),
      lines: lines.filter((l) => Number(l.finding_id) === fid).map(toLine),
    };
  });
}

/** Locks the finding's row for the rest of the transaction (a send and an edit of it queue). */
export async function lockFinding(tx: Knex.Transaction, { shopId, id }: { shopId: number; id: number }): Promise<void> {
  await tx("findings").where({ id, shop_id: shopId }).forUpdate().first("id");
}

export async function getFinding(key: JobKey & { id: number }, k: Knex = db()): Promise<FindingRow | null> {
  return (await listFindings(key, k))[0] ?? null;
}

export type FindingWrite = {
  title: string;
  found: string;
  whyItMatters: string | null;
  safety: SafetyCategory;
  evidence: StoredEvidence[];
  /** `id` names a line being kept; lines of the finding not listed are removed. */
  lines: (DraftLine & { id?: number })[];
};

/** Runs after the lines are written, in the same transaction, with each line's id in order (issue 19: the lines' parts). */
export type AfterLines = (tx: Knex.Transaction, findingId: number, lineIds: number[]) => Promise<void>;

async function writeChildren(tx: Knex.Transaction, shopId: number, findingId: number, f: FindingWrite, afterLines?: AfterLines) {
  const ids: number[] = [];
  await tx("finding_evidence").where({ shop_id: shopId, finding_id: findingId }).delete();
  if (f.evidence.length) {
    await tx("finding_evidence").insert(f.evidence.map((e, position) => ({ shop_id: shopId, finding_id: findingId, position, kind: e.kind, ref: e.ref, moment_ms: e.momentMs })));
  }
  const kept = f.lines.flatMap((l) => (l.id ? [l.id] : []));
  await tx("finding_lines").where({ shop_id: shopId, finding_id: findingId }).whereNotIn("id", kept.length ? kept : [0]).delete();
  for (const [position, line] of f.lines.entries()) {
    const row = {
      position,
      kind: line.kind,
      description: line.description,
      part_number: line.partNumber,
      qty_thousandths: line.qtyThousandths,
      unit_price_minor: line.unitPriceMinor,
      hours_tenths: line.hoursTenths,
      rate_minor: line.rateMinor,
      amount_minor: line.amountMinor,
      taxable: line.taxable,
      // A line saved again stands again (only possible before the owner answers): syncLineParts
      // gives it a part once more if its part had left the job (migration 38).
      withdrawn_at: null,
      withdrawn_by_user_id: null,
      withdrawn_reason: null,
    };
    if (line.id) {
      const n = await tx("finding_lines").where({ id: line.id, shop_id: shopId, finding_id: findingId }).update(row);
      if (n !== 1) throw new AppError("conflict", "A line of this finding was removed meanwhile. Reload and try again.");
      ids.push(line.id);
    } else {
      const [id] = await tx("finding_lines").insert({ shop_id: shopId, finding_id: findingId, ...row });
      ids.push(Number(id));
    }
  }
  if (afterLines) await afterLines(tx, findingId, ids);
}

export async function insertFinding(p: JobKey & { userId: number; finding: FindingWrite; afterLines?: AfterLines }): Promise<number> {
  return transaction(async (tx) => {
    const [id] = await tx("findings").insert({
      shop_id: p.shopId,
      job_id: p.jobId,
      title: p.finding.title,
      found: p.finding.found,
      why_it_matters: p.finding.whyItMatters,
      safety: p.finding.safety,
      created_by_user_id: p.userId,
    });
    await writeChildren(tx, p.shopId, Number(id), p.finding, p.afterLines);
    return Number(id);
  });
}

/** Saves a finding if nobody saved it since `expectedVersion`; returns the new version. */
export async function updateFinding(p: JobKey & { id: number; expectedVersion: number; finding: FindingWrite; afterLines?: AfterLines }): Promise<number> {
  return transaction(async (tx) => {
    const row = await tx("findings").where({ id: p.id, shop_id: p.shopId, job_id: p.jobId }).forUpdate().first("version");
    if (!row) throw new AppError("not_found", "That finding isn't on this job.");
    if (Number(row.version) !== p.expectedVersion) throw new AppError("conflict", "Someone saved this finding since you opened it. Reload to see their changes.");
    const version = p.expectedVersion + 1;
    await tx("findings")
      .where({ id: p.id })
      .update({ title: p.finding.title, found: p.finding.found, why_it_matters: p.finding.whyItMatters, safety: p.finding.safety, version, updated_at: tx.fn.now(3) });
    await writeChildren(tx, p.shopId, p.id, p.finding, p.afterLines);
    return version;
  });
}

// ---- what can be attached as evidence ------------------------------------------------------------

export type EvidencePhoto = TimelinePhoto & { caption: string | null };
/** Everything a reading's one line needs (lib/reading-text.ts): never the number without its limit. */
export type EvidenceReading = {
  id: string;
  label: string;
  value: number;
  unit: string | null;
  verdict: ReadingVerdict;
  min: number | null;
  max: number | null;
  source: string | null;
  chain: ChainSnapshot | null;
  decimals: ReadingDecimals;
};
/** moments: the ones staff marked in the clip, earliest first (issue 18 §6: offered as evidence, caption and all). */
export type EvidenceClip = { id: string; caption: string | null; durationSeconds: number | null; playbackId: string | null; aspectRatio: string | null; moments: ClipMoment[] };
export type EvidenceChoices = { photos: EvidencePhoto[]; readings: EvidenceReading[]; clips: EvidenceClip[] };

/** The job's posted photos, readings and ready clips (what a finding may point at), newest first. */
export async function listEvidenceChoices({ shopId, jobId }: JobKey, k: Knex = db()): Promise<EvidenceChoices> {
  type PhotoChoice = Pick<PhotosTable, "public_id" | "width" | "height"> & Pick<JournalEntriesTable, "caption">;
  type ClipChoice = Pick<ClipsTable, "public_id" | "duration_seconds" | "playback_id" | "aspect_ratio"> & Pick<JournalEntriesTable, "caption">;
  type ReadingChoice = Pick<ReadingsTable, "id" | "label" | "value" | "unit" | "verdict" | "min_value" | "max_value" | "source" | "chain" | "value_decimals" | "min_decimals" | "max_decimals">;
  type MomentChoice = Pick<ClipsTable, "public_id"> & Pick<ClipMomentsTable, "at_ms" | "label">;
  const [photos, readings, clips, moments]: [PhotoChoice[], ReadingChoice[], ClipChoice[], MomentChoice[]] = await Promise.all([
    k("photos as p")
      .join("journal_entries as e", "e.id", "p.entry_id")
      .where({ "p.shop_id": shopId, "p.job_id": jobId })
      .whereNull("e.deleted_at")
      .orderBy([{ column: "p.entry_id", order: "desc" }, "p.position"])
      .select("p.public_id", "p.width", "p.height", "e.caption"),
    k("readings")
      .where({ shop_id: shopId, job_id: jobId })
      .orderBy("id", "desc")
      .select("id", "label", "value", "unit", "verdict", "min_value", "max_value", "source", "chain", "value_decimals", "min_decimals", "max_decimals"),
    k("clips as c")
      .join("journal_entries as e", "e.id", "c.entry_id")
      .where({ "c.shop_id": shopId, "c.job_id": jobId, "c.status": "ready" })
      .whereNull("e.deleted_at")
      .orderBy("c.id", "desc")
      .select("c.public_id", "c.duration_seconds", "c.playback_id", "c.aspect_ratio", "e.caption"),
    k("clip_moments as m")
      .join("clips as c", (j) => j.on("c.id", "m.clip_id").andOn("c.shop_id", "m.shop_id"))
      .where({ "c.shop_id": shopId, "c.job_id": jobId, "c.status": "ready" })
      .orderBy([{ column: "m.clip_id" }, { column: "m.at_ms" }, { column: "m.id" }])
      .select("c.public_id", "m.at_ms", "m.label"),
  ]);
  return {
    photos: photos.map((p) => {
      const id = String(p.public_id);
      return { id, width: Number(p.width), height: Number(p.height), thumbUrl: photoUrl(id, "thumb"), displayUrl: photoUrl(id, "display"), caption: p.caption ?? null };
    }),
    readings: readings.map((r) => ({
      id: String(r.id),
      label: String(r.label),
      value: Number(r.value),
      unit: r.unit ?? null,
      verdict: r.verdict,
      min: num(r.min_value),
      max: num(r.max_value),
      source: r.source ?? null,
      chain: (typeof r.chain === "string" ? JSON.parse(r.chain) : (r.chain ?? null)) as ChainSnapshot | null,
      decimals: { value: num(r.value_decimals), min: num(r.min_decimals), max: num(r.max_decimals) },
    })),
    clips: clips.map((c) => ({
      id: String(c.public_id),
      caption: c.caption ?? null,
      durationSeconds: num(c.duration_seconds),
      playbackId: c.playback_id ?? null,
      aspectRatio: c.aspect_ratio ?? null,
      moments: moments.filter((m) => m.public_id === c.public_id).map((m) => ({ atMs: Number(m.at_ms), label: String(m.label) })),
    })),
  };
}

/** How to reach the machine's owner: the request e-mail's address (null: none on file) and their phone. */
export async function getCustomerContact({ shopId, customerId }: { shopId: number; customerId: number }): Promise<{ email: string | null; phone: string | null }> {
  const row = await db()("customers").where({ shop_id: shopId, id: customerId }).first("email", "phone");
  return { email: row?.email ?? null, phone: row?.phone ?? null };
}
