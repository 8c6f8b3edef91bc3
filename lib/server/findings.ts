import "server-only";
import { latestRequestOfFinding } from "@/db/queries/approvals";
import { type FindingWrite, type StoredEvidence, type StoredLine, getFinding, getMoneySettings, insertFinding, listEvidenceChoices, updateFinding } from "@/db/queries/findings";
import { getShopCurrency } from "@/db/queries/shops";
import type { DraftLine, ShopMoneySettings } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import { parseHours, parseMoney, parseQuantity } from "@/lib/money";
import { type Actor, can } from "@/lib/permissions";
import type { EvidenceInput, FindingInput, LineInput } from "@/lib/schemas/approvals";
import type { JobAccess } from "@/lib/server/access";
import { linePartsHook, priceLineParts } from "@/lib/server/part-pricing";

// Findings: the technician drafts (what was found, why it matters, evidence, proposed lines);
// the desk prices. Typed numbers are read with lib/money.ts in the shop's currency and a bad one
// is refused with the field it came from. Who may draft is declared by the handler (lib/server/access.ts).

/** Prices come from the desk only: the people who may send a request. */
const mayPriceOn = (actor: Actor, found: JobAccess) => can(actor, "approvals:send", found.resource);

/** Reads one typed value, pinning a bad one to its field (`lines.2.unitPrice`). */
function field<T>(key: string, read: () => T): T {
  try {
    return read();
  } catch (error) {
    if (error instanceof AppError && error.code === "invalid") throw new AppError("invalid", error.message, { [key]: [error.message] });
    throw error;
  }
}

const PRICE_FIELDS = ["unitPrice", "rate", "amount"] as const;

/**
 * The lines to store: typed text read exactly; prices only from someone who may price (a
 * technician's save keeps the prices already there). A new labour line starts at the shop's rate.
 */
export function readLines(input: LineInput[], existing: StoredLine[], opts: { currency: string; mayPrice: boolean; settings: ShopMoneySettings }): (DraftLine & { id?: number })[] {
  const byId = new Map(existing.map((l) => [l.id, l]));
  return input.map((line, i) => {
    const key = (name: string) => `lines.${i}.${name}`;
    const before = line.id ? byId.get(line.id) : undefined;
    if (line.id && !before) throw new AppError("conflict", "A line of this finding was removed meanwhile. Reload and try again.");
    if (!opts.mayPrice) {
      const priced = PRICE_FIELDS.find((f) => line[f] !== undefined);
      if (priced) throw new AppError("forbidden", "Only the service writer or the shop owner sets prices.", { [key(priced)]: ["Leave prices to the desk."] });
    }
    const money = (name: (typeof PRICE_FIELDS)[number], kept: number | null) => {
      const text = line[name];
      if (text === undefined) return kept;
      return text === "" ? null : field(key(name), () => parseMoney(text, opts.currency));
    };
    const sameKind = before?.kind === line.kind ? before : undefined;
    const base: DraftLine = {
      kind: line.kind,
      description: line.description,
      partNumber: line.kind === "part" ? line.partNumber : null,
      qtyThousandths: null,
      unitPriceMinor: null,
      hoursTenths: null,
      rateMinor: null,
      amountMinor: null,
      taxable: opts.mayPrice && line.taxable !== undefined ? line.taxable : (sameKind?.taxable ?? opts.settings.taxable[line.kind]),
    };
    if (line.kind === "part") {
      base.qtyThousandths = field(key("qty"), () => positive(parseQuantity(line.qty ?? "", opts.currency), "The quantity"));
      base.unitPriceMinor = money("unitPrice", sameKind?.unitPriceMinor ?? null);
    } else if (line.kind === "labour") {
      base.hoursTenths = field(key("hours"), () => positive(parseHours(line.hours ?? "", opts.currency), "The hours"));
      base.rateMinor = money("rate", sameKind ? sameKind.rateMinor : opts.settings.labourRateMinor);
    } else {
      base.amountMinor = money("amount", sameKind?.amountMinor ?? null);
    }
    return line.id ? { ...base, id: line.id } : base;
  });
}

function positive(n: number, what: string): number {
  if (n <= 0) throw new AppError("invalid", `${what} must be more than zero.`);
  return n;
}

/** Evidence must be this job's own: posted photos, its readings, its ready clips. Repeats are dropped. */
async function checkEvidence(job: { shopId: number; id: number }, evidence: EvidenceInput[]): Promise<StoredEvidence[]> {
  if (!evidence.length) return [];
  const choices = await listEvidenceChoices({ shopId: job.shopId, jobId: job.id });
  const seen = new Set<string>();
  const out: StoredEvidence[] = [];
  for (const [i, e] of evidence.entries()) {
    const key = `${e.kind}:${e.ref}:${e.momentMs ?? ""}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const bad = (message: string) => new AppError("invalid", message, { [`evidence.${i}`]: [message] });
    if (e.kind === "photo" && !choices.photos.some((p) => p.id === e.ref)) throw bad("That photo isn't posted on this job. Pick one of the job's photos.");
    if (e.kind === "reading" && !choices.readings.some((r) => r.id === e.ref)) throw bad("That reading isn't on this job.");
    if (e.kind === "clip") {
      const clip = choices.clips.find((c) => c.id === e.ref);
      if (!clip) throw bad("That clip isn't ready on this job.");
      if (e.momentMs != null && clip.durationSeconds != null && e.momentMs > clip.durationSeconds * 1000) throw bad("That moment is past the end of the clip.");
    }
    out.push({ kind: e.kind, ref: e.ref, momentMs: e.kind === "clip" ? e.momentMs : null });
  }
  return out;
}

async function toWrite(job: { shopId: number; id: number }, input: FindingInput, existing: StoredLine[], mayPrice: boolean, currency: string) {
  const settings = await getMoneySettings({ shopId: job.shopId });
  // Part lines: the markup rule prices from the cost, and each line gets its job part (issue 19).
  const { lines, parts } = await priceLineParts(job, input.lines, readLines(input.lines, existing, { currency, mayPrice, settings }), existing, { currency, mayPrice });
  const write: FindingWrite = {
    title: input.title,
    found: input.found,
    whyItMatters: input.whyItMatters,
    safety: input.safety,
    evidence: await checkEvidence(job, input.evidence),
    lines,
  };
  return { write, parts };
}

export async function createFinding(actor: Actor, found: JobAccess, input: FindingInput) {
  const { job } = found;
  const { write, parts } = await toWrite(job, input, [], mayPriceOn(actor, found), await getShopCurrency({ shopId: job.shopId }));
  const id = await insertFinding({ shopId: job.shopId, jobId: job.id, userId: actor.userId, finding: write, afterLines: linePartsHook(job, actor.userId, parts) });
  return { id, version: 1, job };
}

/**
 * Saves a finding. An answered finding is closed (its decision stands; more work is a new
 * finding); while a request is out, the saved finding is the draft of a revision.
 */
export async function saveFinding(actor: Actor, found: JobAccess, findingId: number, input: FindingInput) {
  const { job } = found;
  if (input.version == null) throw new AppError("invalid", "Say which version of the finding you edited.", { version: ["Reload and try again."] });
  const finding = await getFinding({ shopId: job.shopId, jobId: job.id, id: findingId });
  if (!finding) throw new AppError("not_found", "That finding isn't on this job.");
  const latest = await latestRequestOfFinding({ shopId: job.shopId, findingId });
  if (latest?.status === "answered") throw new AppError("conflict", "The owner has answered this finding, so it can't change. Draft a new finding for more work.");
  const { write, parts } = await toWrite(job, input, finding.lines, mayPriceOn(actor, found), await getShopCurrency({ shopId: job.shopId }));
  const version = await updateFinding({ shopId: job.shopId, jobId: job.id, id: findingId, expectedVersion: input.version, finding: write, afterLines: linePartsHook(job, actor.userId, parts) });
  return { id: findingId, version, job };
}
