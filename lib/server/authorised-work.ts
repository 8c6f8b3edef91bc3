import "server-only";
import type { Tx } from "@/db/transaction";
import { listDecisions, listRequests } from "@/db/queries/approvals";
import { type DropoffRow, getDropoff } from "@/db/queries/dropoff";
import type { DecisionMethod } from "@/lib/approvals";
import { diagnosisLine } from "@/lib/dropoff";
import { type InvoiceLine, totalAuthorisedPreTax } from "@/lib/invoices";
import { partsOfRequestLines } from "@/db/queries/parts-pricing";
import type { PartStatus } from "@/lib/bench";

// What the owner authorised on a job, read from the approval records: the approved lines with
// their prices as shown (the frozen snapshots), the authorised pre-tax total, and the record of who
// approved what, when and how, which the invoice prints. The signed drop-off authorisation
// (lib/server/dropoff.ts) counts too: its diagnosis charge is an authorised line, its "authorised
// up to" amount is part of what the owner authorised, and it heads the record.

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
};

/** A part is billed once it is in the machine (fitted, or fitted and its old one handed back). */
export const BILLABLE_PART: readonly PartStatus[] = ["fitted", "returned"];

/** Read in the caller's transaction when `k` is given, else on the pool. */
export async function authorisedWork({ shopId, jobId }: { shopId: number; jobId: number }, k?: Tx): Promise<AuthorisedWork> {
  const requests = await listRequests({ shopId, jobId }, k);
  const decisions = await listDecisions({ shopId, requestIds: requests.map((r) => r.id) }, k);
  const dropoff = await getDropoff({ shopId, jobId }, k);
  const lineParts = await partsOfRequestLines({ shopId, jobId }, k);
  const partsNotFitted: AuthorisedWork["partsNotFitted"] = [];
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
      authorisedPreTaxMinor: signed.authorisedUpToMinor,
      authorisedTotalMinor: signed.authorisedUpToMinor,
    });
  }
  for (const r of requests) {
    const d = decisions.get(r.id);
    if (!d) continue;
    const approvedNos = new Set(d.lines.filter((l) => l.answer === "approved").map((l) => l.no));
    for (const line of r.snapshot.lines) {
      if (!approvedNos.has(line.no)) continue;
      const { no, grossMinor: _g, netMinor: _n, taxMinor: _t, ...draft } = line;
      // A part line with its job part waits for the part to be fitted (received isn't billed).
      const part = lineParts.get(`${r.publicId}#${no}`);
      if (part && !BILLABLE_PART.includes(part.status)) {
        partsNotFitted.push({ description: part.description, status: part.status });
        continue;
      }
      lines.push({ ...draft, source: "authorised", requestPublicId: r.publicId, requestLineNo: no });
    }
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
      authorisedPreTaxMinor: d.authorisedPreTaxMinor,
      authorisedTotalMinor: d.authorisedTotalMinor,
    });
  }
  return {
    lines,
    authorisedPreTaxMinor: totalAuthorisedPreTax(
      signed?.authorisedUpToMinor ?? null,
      record.filter((e) => e.kind === "request").map((e) => e.authorisedPreTaxMinor),
    ),
    record,
    wantsPartsBack: record.some((e) => e.wantsPartsBack),
    dropoff,
    openRequests: requests.filter((r) => r.status === "sent").map((r) => ({ publicId: r.publicId, title: r.snapshot.finding.title })),
    partsNotFitted,
  };
}

/** The same line of the same request (or the same part's core charge / credit), so syncing never brings one in twice. */
export const lineKey = (l: Pick<InvoiceLine, "requestPublicId" | "requestLineNo"> & Partial<Pick<InvoiceLine, "source" | "partId">>) =>
  l.source === "core_charge" || l.source === "core_credit" ? `${l.source}:${l.partId}` : `${l.requestPublicId}#${l.requestLineNo}`;
