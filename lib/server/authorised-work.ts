import "server-only";
import type { Tx } from "@/db/transaction";
import { listDecisions, listRequests } from "@/db/queries/approvals";
import { type DropoffRow, getDropoff } from "@/db/queries/dropoff";
import { type Answers, type DecisionMethod, decisionTotals } from "@/lib/approvals";
import { diagnosisLine } from "@/lib/dropoff";
import { type InvoiceLine, type WithdrawnLine, totalAuthorisedPreTax } from "@/lib/invoices";
import { partsOfRequestLines } from "@/db/queries/parts-pricing";
import type { PartStatus } from "@/lib/bench";

// What the owner authorised on a job, read from the approval records: the approved lines with
// their prices as shown (the frozen snapshots), the authorised pre-tax total, and the record of who
// approved what, when and how, which the invoice prints. The signed drop-off authorisation
// (lib/server/dropoff.ts) counts too: its diagnosis charge is an authorised line, its "authorised
// up to" amount is part of what the owner authorised, and it heads the record.
// An approved part line whose part left the job for good (moved to another job that needed it,
// "this job no longer needs it") is withdrawn (migration 38): it stays in the record as approved,
// listed again as withdrawn with who, when and why, and is neither billed nor counted in what the
// owner authorised (that request's authorised amount is worked out again without it).

export type AuthorisationEntry = {
  /** "dropoff": the authorisation signed at drop-off (`request` is its public id, `note` its wording). */
  kind: "request" | "dropoff";
  request: string;
  title: string;
  version: number;
  method: DecisionMethod;
  personName: string;
  signatureName: string | null;
  phoneCalled: string | null;
  note: string | null;
  decidedAt: string;
  recordedBy: string | null;
  wantsPartsBack: boolean;
  shownHash: string;
  currency: string;
  approved: { no: number; description: string; netMinor: number }[];
  declined: { no: number; description: string; netMinor: number }[];
  /** Approved lines withdrawn since (their part left the job): not billed. */
  withdrawn: WithdrawnLine[];
  authorisedPreTaxMinor: number;
  authorisedTotalMinor: number;
};

export type AuthorisedWork = {
  lines: InvoiceLine[];
  authorisedPreTaxMinor: number;
  record: AuthorisationEntry[];
  wantsPartsBack: boolean;
  /** The job's drop-off authorisation, signed or not (only a signed one counts above). */
  dropoff: DropoffRow | null;
  /** Requests sent and not answered yet: their lines aren't authorised. */
  openRequests: { publicId: string; title: string }[];
  /** Approved part lines whose part isn't fitted yet (issue 19): billed once it is, not before. */
  partsNotFitted: { description: string; status: PartStatus }[];
  /** Approved lines withdrawn because their part left the job (issue 19): never billed. */
  linesWithdrawn: (WithdrawnLine & { request: string })[];
};

/** A part is billed once it is in the machine (fitted, or fitted and its old one handed back). */
export const BILLABLE_PART: readonly PartStatus[] = ["fitted", "returned"];

/** Read in the caller's transaction when `k` is given, else on the pool. */
export async function authorisedWork({ shopId, jobId }: { shopId: number; jobId: number }, k?: Tx): Promise<AuthorisedWork> {
  const requests = await listRequests({ shopId, jobId }, k);
  const decisions = await listDecisions({ shopId, requestIds: requests.map((r) => r.id) }, k);
  const dropoff = await getDropoff({ shopId, jobId }, k);
  const { parts: lineParts, withdrawn } = await partsOfRequestLines({ shopId, jobId }, k);
  const partsNotFitted: AuthorisedWork["partsNotFitted"] = [];
  const linesWithdrawn: AuthorisedWork["linesWithdrawn"] = [];
  // What each answered request authorises now (its signed amount, less any withdrawn lines).
  const requestAuthorised: number[] = [];
  const lines: InvoiceLine[] = [];
  const record: AuthorisationEntry[] = [];
  const signed = dropoff?.signature ? { ...dropoff, signature: dropoff.signature } : null;
  if (signed) {
    const diagnosis = diagnosisLine(signed.snapshot);
    if (diagnosis) lines.push({ ...diagnosis, source: "authorised", requestPublicId: signed.publicId, requestLineNo: 1 });
    const sig = signed.signature;
    record.push({
      kind: "dropoff",
      request: signed.publicId,
      title: "Authorisation at drop-off",
      version: 1,
      method: sig.method,
      personName: sig.signatureName,
      signatureName: sig.signatureName,
      phoneCalled: null,
      note: [signed.snapshot.wording, signed.snapshot.terms ? `Also agreed: ${signed.snapshot.terms}` : ""].filter(Boolean).join(" "),
      decidedAt: sig.signedAt,
      recordedBy: sig.recordedBy,
      wantsPartsBack: sig.wantsPartsBack,
      shownHash: sig.shownHash,
      currency: signed.currency,
      approved: diagnosis ? [{ no: 1, description: signed.snapshot.diagnosis.description, netMinor: signed.snapshot.diagnosis.netMinor }] : [],
      declined: [],
      withdrawn: [],
      authorisedPreTaxMinor: signed.authorisedUpToMinor,
      authorisedTotalMinor: signed.authorisedUpToMinor,
    });
  }
  for (const r of requests) {
    const d = decisions.get(r.id);
    if (!d) continue;
    const approvedNos = new Set(d.lines.filter((l) => l.answer === "approved").map((l) => l.no));
    const gone: WithdrawnLine[] = [];
    for (const line of r.snapshot.lines) {
      if (!approvedNos.has(line.no)) continue;
      const { no, grossMinor: _g, netMinor: _n, taxMinor: _t, ...draft } = line;
      const w = withdrawn.get(`${r.publicId}#${no}`);
      if (w) {
        gone.push({ no, description: line.description, netMinor: line.netMinor, ...w });
        continue;
      }
      // A part line with its job part waits for the part to be fitted (received isn't billed).
      const part = lineParts.get(`${r.publicId}#${no}`);
      if (part && !BILLABLE_PART.includes(part.status)) {
        partsNotFitted.push({ description: part.description, status: part.status });
        continue;
      }
      lines.push({ ...draft, source: "authorised", requestPublicId: r.publicId, requestLineNo: no });
    }
    linesWithdrawn.push(...gone.map((g) => ({ ...g, request: r.publicId })));
    if (gone.length) {
      // Priced again as if those lines had been declined: supplies and tax follow the lines left.
      const answers: Answers = Object.fromEntries(d.lines.map((l) => [l.no, l.answer === "approved" && !gone.some((g) => g.no === l.no) ? "approved" : "declined"]));
      requestAuthorised.push(decisionTotals(r.snapshot, answers).authorised.preTaxTotalMinor);
    } else requestAuthorised.push(d.authorisedPreTaxMinor);
    const pick = (answer: "approved" | "declined") => d.lines.filter((l) => l.answer === answer).map((l) => ({ no: l.no, description: l.description, netMinor: l.netMinor }));
    record.push({
      kind: "request",
      request: r.publicId,
      title: r.snapshot.finding.title,
      version: r.version,
      method: d.method,
      personName: d.personName,
      signatureName: d.signatureName,
      phoneCalled: d.phoneCalled,
      note: d.note,
      decidedAt: d.decidedAt,
      recordedBy: d.recordedBy,
      wantsPartsBack: d.wantsPartsBack,
      shownHash: d.shownHash,
      currency: r.currency,
      approved: pick("approved"),
      declined: pick("declined"),
      withdrawn: gone,
      authorisedPreTaxMinor: d.authorisedPreTaxMinor,
      authorisedTotalMinor: d.authorisedTotalMinor,
    });
  }
  return {
    lines,
    authorisedPreTaxMinor: totalAuthorisedPreTax(signed?.authorisedUpToMinor ?? null, requestAuthorised),
    record,
    wantsPartsBack: record.some((e) => e.wantsPartsBack),
    dropoff,
    openRequests: requests.filter((r) => r.status === "sent").map((r) => ({ publicId: r.publicId, title: r.snapshot.finding.title })),
    partsNotFitted,
    linesWithdrawn,
  };
}

/** The same line of the same request (or the same part's core charge / credit), so syncing never brings one in twice. */
export const lineKey = (l: Pick<InvoiceLine, "requestPublicId" | "requestLineNo"> & Partial<Pick<InvoiceLine, "source" | "partId">>) =>
  l.source === "core_charge" || l.source === "core_credit" ? `${l.source}:${l.partId}` : `${l.requestPublicId}#${l.requestLineNo}`;
