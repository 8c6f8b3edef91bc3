import crypto from "node:crypto";
import type { Knex } from "knex";
import type { Actor } from "../../lib/permissions";
import type { FindingInput } from "../../lib/schemas/approvals";
import { access } from "../../lib/server/access";
import { answerRequest, sendRequest } from "../../lib/server/approvals";
import { changeJobPartStatus } from "../../lib/server/bench-parts";
import { listParts } from "../../db/queries/bench-parts";
import { createFinding } from "../../lib/server/findings";
import type { makeShop } from "./fixtures";
import { makeCustomerWithJobs } from "./fixtures";

// Jobs whose owner has authorised work, made through the real approval flow (the desk prices and
// sends a finding, the owner answers online), for invoice and payment tests.

type Shop = Awaited<ReturnType<typeof makeShop>>;

export const staffActor = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});

/** A signed-in machine owner with `count` jobs in the shop (status "inspecting"). */
export async function ownerWithJobs(k: Knex, shop: Shop, count: number, name = "Ada Marsh") {
  const email = `owner.${crypto.randomBytes(4).toString("hex")}@mail.test`;
  const [userId] = await k("users").insert({ email, name });
  const made = await makeCustomerWithJobs(k, shop.id, { name, email, userId: Number(userId), statuses: Array(count).fill("inspecting") });
  const jobs = await Promise.all(made.jobIds.map(async (id) => ({ id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) })));
  const owner: Actor = { userId: Number(userId), email, name, memberships: [] };
  return { owner, jobs, customerId: made.customerId };
}

export type PricedLine = { kind: "part"; description: string; qty: string; unitPrice: string } | { kind: "labour"; description: string; hours: string; rate: string } | { kind: "fee"; description: string; amount: string };

/**
 * The desk prices and sends a finding; the owner approves the lines whose index is in `approve` (all by default).
 * Every part line has its job part (issue 19), billed once fitted: unless `fitParts` is false, the
 * bench then fits the approved ones, so the invoice takes them as these tests expect.
 */
export async function authorise(p: { writer: Actor; owner: Actor; jobPublicId: string; title: string; lines: PricedLine[]; approve?: number[]; wantsPartsBack?: boolean; fitParts?: boolean }) {
  const input: FindingInput = {
    title: p.title,
    found: `${p.title}: found on inspection.`,
    whyItMatters: null,
    safety: "none",
    evidence: [],
    lines: p.lines.map((l) => ({ ...l, partNumber: null })),
  };
  const made = await createFinding(p.writer, await access(p.writer, "job", p.jobPublicId, "approvals:draft"), input);
  const sent = await sendRequest(p.writer, await access(p.writer, "job", p.jobPublicId, "approvals:send"), made.id, { findingVersion: made.version });
  const approve = new Set(p.approve ?? p.lines.map((_, i) => i));
  const { decision } = await answerRequest(
    p.owner,
    await access(p.owner, "request", sent.publicId, "approvals:answer"),
    { shownHash: sent.hash, lines: p.lines.map((_, i) => ({ no: i + 1, answer: approve.has(i) ? "approved" : "declined" })), signature: p.owner.name, wantsPartsBack: p.wantsPartsBack ?? false, confirmed: true },
    { ip: "203.0.113.9", userAgent: "vitest" },
  );
  if (p.fitParts ?? true) {
    const managing = await access(p.writer, "job", p.jobPublicId, "parts:manage");
    const parts = await listParts({ shopId: managing.job.shopId, jobId: managing.job.id });
    for (const part of parts.filter((r) => r.findingId === made.id && r.ownerAnswer === "approved" && r.status === "needed")) {
      await changeJobPartStatus(p.writer, managing, { part: part.id, from: "needed", to: "fitted", expectedOn: null });
    }
  }
  return { requestPublicId: sent.publicId, decision };
}
