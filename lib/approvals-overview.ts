// The staff panel's picture of a job's approvals: each finding's state, each request's life
// (sent, opened, answered, withdrawn, replaced), what is authorised against what was estimated,
// and a warning for priced work that would go past what the owner has authorised. Pure.
import { type DecisionMethod, type DraftLine, type LineKind, type RequestStatus, type SafetyCategory, type ShopMoneySettings, type SnapshotTotals, toMoneyLine } from "@/lib/approvals";
import { formatMoney, needsApproval, toleranceFor, totals } from "@/lib/money";

export type FindingState = "draft" | "sent" | "answered" | "withdrawn";

export type RequestSummary = {
  publicId: string;
  version: number;
  status: RequestStatus;
  sentAt: string;
  sentTo: string | null;
  sentBy: string | null;
  openedAt: string | null;
  answeredAt: string | null;
  withdrawnAt: string | null;
  replacedBy: string | null;
  estimatePreTaxMinor: number;
  estimateTotalMinor: number;
  decision: {
    method: DecisionMethod;
    personName: string;
    decidedAt: string;
    approved: number;
    declined: number;
    wantsPartsBack: boolean;
    authorisedPreTaxMinor: number;
    authorisedTotalMinor: number;
  } | null;
};

export type FindingSummary = {
  id: number;
  title: string;
  safety: SafetyCategory;
  version: number;
  createdBy: string | null;
  updatedAt: string;
  state: FindingState;
  lineCount: number;
  /** Totals of the lines as they stand, or why they can't be worked out yet. */
  draft: { totals: SnapshotTotals } | { missing: string };
  /** Saved after the open request was sent: sending again replaces it. */
  changedSinceSent: boolean;
  /** Newest first. */
  requests: RequestSummary[];
};

export type WorkLine = { requestPublicId: string; lineNo: number; kind: LineKind; description: string; netMinor: number };

export type ApprovalsOverview = {
  currency: string;
  authorised: { preTaxMinor: number; totalMinor: number; lines: WorkLine[] };
  estimated: { preTaxMinor: number; totalMinor: number };
  declined: WorkLine[];
  awaiting: { count: number; totalMinor: number };
  findings: FindingSummary[];
  warnings: { findingId: number; message: string }[];
};

export type OverviewInput = {
  currency: string;
  settings: ShopMoneySettings;
  findings: { id: number; title: string; safety: SafetyCategory; version: number; createdBy: string | null; updatedAt: string; lines: DraftLine[] }[];
  requests: (Omit<RequestSummary, "decision"> & { findingId: number })[];
  decisions: Map<string, NonNullable<RequestSummary["decision"]> & { lines: { no: number; answer: "approved" | "declined"; kind: LineKind; description: string; netMinor: number }[] }>;
};

function draftTotals(lines: DraftLine[], settings: ShopMoneySettings): FindingSummary["draft"] {
  if (!lines.length) return { missing: "No lines yet." };
  try {
    const t = totals(lines.map(toMoneyLine), { tax: settings.tax, supplies: settings.supplies });
    return { totals: { subtotalMinor: t.subtotalMinor, suppliesMinor: t.suppliesMinor, taxMinor: t.taxMinor, preTaxTotalMinor: t.preTaxTotalMinor, totalMinor: t.totalMinor } };
  } catch (error) {
    return { missing: (error as Error).message };
  }
}

export function buildOverview(input: OverviewInput): ApprovalsOverview {
  const money = (n: number) => formatMoney(n, input.currency);
  const authorisedLines: WorkLine[] = [];
  const declined: WorkLine[] = [];
  let authorisedPreTax = 0;
  let authorisedTotal = 0;
  let estimatedPreTax = 0;
  let estimatedTotal = 0;
  for (const r of input.requests) {
    const d = input.decisions.get(r.publicId);
    if (!d) continue;
    authorisedPreTax += d.authorisedPreTaxMinor;
    authorisedTotal += d.authorisedTotalMinor;
    estimatedPreTax += r.estimatePreTaxMinor;
    estimatedTotal += r.estimateTotalMinor;
    for (const l of d.lines) (l.answer === "approved" ? authorisedLines : declined).push({ requestPublicId: r.publicId, lineNo: l.no, kind: l.kind, description: l.description, netMinor: l.netMinor });
  }
  const open = input.requests.filter((r) => r.status === "sent");

  const findings = input.findings.map((f): FindingSummary => {
    const requests = input.requests
      .filter((r) => r.findingId === f.id)
      .sort((a, b) => b.version - a.version)
      .map(({ findingId: _f, ...r }) => ({ ...r, decision: input.decisions.get(r.publicId) ? pickDecision(input.decisions.get(r.publicId)!) : null }));
    const latest = requests[0];
    const state: FindingState = !latest ? "draft" : latest.status === "replaced" ? "sent" : latest.status;
    return {
      id: f.id,
      title: f.title,
      safety: f.safety,
      version: f.version,
      createdBy: f.createdBy,
      updatedAt: f.updatedAt,
      state,
      lineCount: f.lines.length,
      draft: draftTotals(f.lines, input.settings),
      changedSinceSent: state === "sent" && !!latest && f.updatedAt > latest.sentAt,
      requests,
    };
  });

  // Work not yet authorised that would push the job past what the owner agreed to (pre-tax, as
  // the consent rules compare it), with the shop's tolerance.
  const warnings: ApprovalsOverview["warnings"] = [];
  for (const f of findings) {
    if (f.state === "answered" || !("totals" in f.draft)) continue;
    const adds = f.draft.totals.preTaxTotalMinor;
    if (!needsApproval(authorisedPreTax, authorisedPreTax + adds, input.settings.tolerance)) continue;
    const allowed = toleranceFor(authorisedPreTax, input.settings.tolerance);
    const waiting = f.state === "sent" && !f.changedSinceSent ? " It is waiting for the owner's answer: don't start it before they approve." : " Send it for the owner's approval before doing the work.";
    warnings.push({
      findingId: f.id,
      message: `“${f.title}” adds ${money(adds)} before tax, beyond what the owner has authorised (${money(authorisedPreTax)}${allowed ? `, plus the shop's tolerance of ${money(allowed)}` : ""}).${waiting}`,
    });
  }

  return {
    currency: input.currency,
    authorised: { preTaxMinor: authorisedPreTax, totalMinor: authorisedTotal, lines: authorisedLines },
    estimated: { preTaxMinor: estimatedPreTax, totalMinor: estimatedTotal },
    declined,
    awaiting: { count: open.length, totalMinor: open.reduce((a, r) => a + r.estimateTotalMinor, 0) },
    findings,
    warnings,
  };
}

function pickDecision(d: NonNullable<RequestSummary["decision"]>): NonNullable<RequestSummary["decision"]> {
  return {
    method: d.method,
    personName: d.personName,
    decidedAt: d.decidedAt,
    approved: d.approved,
    declined: d.declined,
    wantsPartsBack: d.wantsPartsBack,
    authorisedPreTaxMinor: d.authorisedPreTaxMinor,
    authorisedTotalMinor: d.authorisedTotalMinor,
  };
}
