import "server-only";
import { type DecisionRow, latestRequestOfFinding, listDecisions, listRequests, markOpened } from "@/db/queries/approvals";
import { type EvidenceClip, listEvidenceChoices, listFindings } from "@/db/queries/findings";
import { getShopBySlug, getShopCurrency } from "@/db/queries/shops";
import { type ApprovalsOverview, buildOverview } from "@/lib/approvals-overview";
import type { RequestSnapshot, RequestStatus } from "@/lib/approvals";
import { clipMediaUrls } from "@/lib/clips";
import { AppError } from "@/lib/errors";
import type { TimelineClip, TimelinePhoto } from "@/lib/journal";
import { describeMachine } from "@/lib/machine";
import { type Actor, can } from "@/lib/permissions";
import type { Resolved } from "@/lib/server/access";
import { moneySettingsOf } from "@/lib/server/request-cache";

// Read models for the approval screens: the staff panel's overview of a job, and one request as
// its reader sees it (the owner's answer page, the desk's record of it).

/**
 * The staff panel: findings, requests, decisions and warnings for one job (its caller has checked
 * that the reader is the shop's). Amounts included: they leave only for people with `money:view`.
 */
export async function jobApprovals(job: { id: number; shopId: number }, shopCurrency?: string): Promise<ApprovalsOverview> {
  const key = { shopId: job.shopId, jobId: job.id };
  // Money settings through the render's cache (the staff job page's drop-off card reads them
  // too); the currency from a caller that holds the shop row already.
  const [findings, requests, settings, currency] = await Promise.all([
    listFindings(key),
    listRequests(key),
    moneySettingsOf(job.shopId),
    shopCurrency ?? getShopCurrency({ shopId: job.shopId }),
  ]);
  const decisions = await listDecisions({ shopId: job.shopId, requestIds: requests.map((r) => r.id) });
  const byPublic = new Map(
    requests.flatMap((r) => {
      const d = decisions.get(r.id);
      if (!d) return [];
      return [
        [
          r.publicId,
          {
            method: d.method,
            personName: d.personName,
            decidedAt: d.decidedAt,
            approved: d.lines.filter((l) => l.answer === "approved").length,
            declined: d.lines.filter((l) => l.answer === "declined").length,
            wantsPartsBack: d.wantsPartsBack,
            authorisedPreTaxMinor: d.authorisedPreTaxMinor,
            authorisedTotalMinor: d.authorisedTotalMinor,
            lines: d.lines,
          },
        ] as const,
      ];
    }),
  );
  return buildOverview({
    currency,
    settings,
    findings: findings.map((f) => ({ id: f.id, title: f.title, safety: f.safety, version: f.version, createdBy: f.createdBy, updatedAt: f.updatedAt, lines: f.lines })),
    requests: requests.map((r) => ({
      publicId: r.publicId,
      findingId: r.findingId,
      version: r.version,
      status: r.status,
      sentAt: r.sentAt,
      sentTo: r.sentTo,
      sentBy: r.sentBy,
      openedAt: r.openedAt,
      answeredAt: r.answeredAt,
      withdrawnAt: r.withdrawnAt,
      replacedBy: r.replacedBy,
      estimatePreTaxMinor: r.estimatePreTaxMinor,
      estimateTotalMinor: r.estimateTotalMinor,
    })),
    decisions: new Map(byPublic),
  });
}

export type EvidenceView = {
  photos: TimelinePhoto[];
  /** Readings and clip moments; a clip that is still ready comes with what the player needs. */
  others: { kind: "reading" | "clip"; label: string; momentMs: number | null; ref: string; clip?: TimelineClip | null }[];
};

/** Evidence photos through the request's own route: the owner may see them even if their entry is shop-only. */
export function evidenceView(snapshot: RequestSnapshot, dims: Map<string, { width: number; height: number }>, clips: EvidenceClip[] = []): EvidenceView {
  const clipFor = (ref: string): TimelineClip | null => {
    const c = clips.find((x) => x.id === ref);
    if (!c?.playbackId) return null;
    return { id: c.id, status: "ready", durationSeconds: c.durationSeconds, aspectRatio: c.aspectRatio, error: null, ...clipMediaUrls(c.id) };
  };
  const url = (photo: string, size: "thumb" | "display") => `/api/approvals/${snapshot.request}/evidence/${photo}/${size}`;
  return {
    photos: snapshot.evidence
      .filter((e) => e.kind === "photo")
      .map((e) => ({ id: e.ref, width: dims.get(e.ref)?.width ?? 640, height: dims.get(e.ref)?.height ?? 480, thumbUrl: url(e.ref, "thumb"), displayUrl: url(e.ref, "display") })),
    others: snapshot.evidence.flatMap((e) =>
      e.kind === "photo" ? [] : [{ kind: e.kind, ref: e.ref, momentMs: e.momentMs, label: e.label ?? (e.kind === "clip" ? "Clip" : "Reading"), clip: e.kind === "clip" ? clipFor(e.ref) : null }],
    ),
  };
}

export type RequestView = {
  publicId: string;
  jobPublicId: string;
  status: RequestStatus;
  version: number;
  hash: string;
  sentAt: string;
  openedAt: string | null;
  snapshot: RequestSnapshot;
  evidence: EvidenceView;
  decision: DecisionRow | null;
  /** The newest version of this finding when it isn't this one (replaced), else null. */
  current: string | null;
  mayAnswer: boolean;
  mayRecord: boolean;
  /** Prices and totals may be shown (technicians see what was asked and answered, not what it costs). */
  mayViewMoney: boolean;
  audience: "shop" | "owner";
  job: { number: number; machine: string; shopName: string; shopSlug: string; timeZone: string; findingId: number; ownerName: string };
};

/**
 * One request for its reader. The owner opening it is recorded once (opened_at); staff looking
 * at it are not the owner opening it. `jobPublicId` is the job in the address, when there is one.
 */
export async function requestView(actor: Actor, { request, job, resource, audience, mayViewMoney }: Resolved<"request">, jobPublicId: string | null): Promise<RequestView> {
  if (jobPublicId != null && request.jobPublicId !== jobPublicId) throw new AppError("not_found", "No such approval request on this job.");
  const mayAnswer = can(actor, "approvals:answer", resource);
  if (mayAnswer && request.status === "sent" && !request.openedAt) await markOpened({ shopId: job.shopId, id: request.id });
  const [decisions, latest, choices, shop] = await Promise.all([
    listDecisions({ shopId: job.shopId, requestIds: [request.id] }),
    latestRequestOfFinding({ shopId: job.shopId, findingId: request.findingId }),
    listEvidenceChoices({ shopId: job.shopId, jobId: job.id }),
    getShopBySlug({ slug: job.shopSlug }),
  ]);
  const dims = new Map(choices.photos.map((p) => [p.id, { width: p.width, height: p.height }]));
  return {
    publicId: request.publicId,
    jobPublicId: request.jobPublicId,
    status: request.status,
    version: request.version,
    hash: request.hash,
    sentAt: request.sentAt,
    openedAt: request.openedAt,
    snapshot: request.snapshot,
    evidence: evidenceView(request.snapshot, dims, choices.clips),
    decision: decisions.get(request.id) ?? null,
    current: latest && latest.publicId !== request.publicId && latest.status !== "withdrawn" ? latest.publicId : null,
    mayAnswer,
    mayRecord: can(actor, "approvals:record-decision", resource),
    mayViewMoney,
    audience,
    job: { number: job.number, machine: describeMachine(job.machine), shopName: job.shopName, shopSlug: job.shopSlug, timeZone: shop?.timezone ?? "UTC", findingId: request.findingId, ownerName: job.customerName },
  };
}
