import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listEvidenceChoices, saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS, FINDING_CAUTIONS } from "@/lib/approvals";
import { CAUTION_DEFERRAL } from "@/lib/cautions";
import type { Action, Actor } from "@/lib/permissions";
import type { FindingInput } from "@/lib/schemas/approvals";
import { access } from "@/lib/server/access";
import { requestView } from "@/lib/server/approval-views";
import { sendRequest } from "@/lib/server/approvals";
import { createFinding, saveFinding } from "@/lib/server/findings";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Issue 18 §6–7 on MariaDB: a finding cites a clip's marked moment (the owner reads the
// technician's caption with it), and carries one of the new safety categories end to end.

type Shop = Awaited<ReturnType<typeof makeShop>>;

describe("clip moments and safety categories on findings", () => {
  let k: Knex;
  let shop: Shop;
  let owner: Actor;
  let job: { id: number; publicId: string };
  const clipId = crypto.randomBytes(16).toString("base64url").slice(0, 22);
  const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);
  /** The technician drafts, the service writer prices the one line and sends: the real flow. */
  async function draftAndSend(input: FindingInput, unitPrice: string) {
    const [tech, writer] = [staffActor(shop, "technician"), staffActor(shop, "service_writer")];
    const made = await createFinding(tech, await onJob(tech, job.publicId, "approvals:draft"), input);
    const saved = await saveFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), made.id, { ...input, version: made.version, lines: [{ ...input.lines[0]!, unitPrice }] });
    return { ...(await sendRequest(writer, await onJob(writer, job.publicId, "approvals:send"), made.id, { findingVersion: saved.version })), findingId: made.id };
  }

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "moments", roles: ["technician", "service_writer"] });
    const made = await ownerWithJobs(k, shop, 1, "Oda Venn");
    owner = made.owner;
    job = made.jobs[0]!;
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS } });
    const [entryId] = await k("journal_entries").insert({ shop_id: shop.id, job_id: job.id, kind: "clip", visibility: "shop", caption: "Rear wheel spin test" });
    const [clipRow] = await k("clips").insert({ public_id: clipId, shop_id: shop.id, job_id: job.id, entry_id: entryId, bytes: 10, upload_id: `up-${clipId}`, status: "ready", duration_seconds: 60, playback_id: "pb-moments", aspect_ratio: "16:9" });
    await k("clip_moments").insert([
      { shop_id: shop.id, clip_id: clipRow, at_ms: 42_300, label: "Cord showing on the shoulder" },
      { shop_id: shop.id, clip_id: clipRow, at_ms: 8_000, label: "Rim runout at the valve" },
    ]);
  });
  afterAll(async () => k?.destroy());

  it("the finding form is offered the clip's marked moments with their captions, earliest first", async () => {
    const choices = await listEvidenceChoices({ shopId: shop.id, jobId: job.id });
    expect(choices.clips).toEqual([expect.objectContaining({ id: clipId, caption: "Rear wheel spin test", moments: [{ atMs: 8_000, label: "Rim runout at the valve" }, { atMs: 42_300, label: "Cord showing on the shoulder" }] })]);
  });

  it("a request citing a marked moment shows the owner the caption with it; the wheels-and-tyres category is kept", async () => {
    const input: FindingInput = {
      title: "Rear tyre worn to the cord",
      found: "Cord visible on the left shoulder.",
      whyItMatters: null,
      safety: "wheels_tyres",
      evidence: [{ kind: "clip", ref: clipId, momentMs: 42_300 }],
      lines: [{ kind: "part", description: "Rear tyre", partNumber: null, qty: "1" }],
    };
    const sent = await draftAndSend(input, "120.00");
    expect((await k("findings").where({ id: sent.findingId }).first("safety"))!.safety).toBe("wheels_tyres");

    const view = await requestView(owner, await access(owner, "request", sent.publicId, "job:view"), job.publicId);
    expect(view.snapshot.finding.safety).toBe("wheels_tyres");
    expect(view.evidence.others).toEqual([expect.objectContaining({ kind: "clip", momentMs: 42_300, label: "Rear wheel spin test — Cord showing on the shoulder" })]);
    // The owner's e-mail carries the category's caution with the deferral (text part).
    const mail = await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `approval:${sent.publicId}` }).first("text");
    expect(mail!.text).toContain(`Safety: ${FINDING_CAUTIONS.wheels_tyres} ${CAUTION_DEFERRAL}`);
  });

  it("a time typed beside no marked moment keeps only the clip's caption", async () => {
    const input: FindingInput = {
      title: "Wheel bearing noise",
      found: "Grinding heard at speed.",
      whyItMatters: null,
      safety: "none",
      evidence: [{ kind: "clip", ref: clipId, momentMs: 20_000 }],
      lines: [{ kind: "part", description: "Wheel bearing", partNumber: null, qty: "2" }],
    };
    const sent = await draftAndSend(input, "18.00");
    const snapshot = JSON.parse((await k("approval_requests").where({ public_id: sent.publicId }).first("canonical"))!.canonical);
    expect(snapshot.evidence).toEqual([expect.objectContaining({ kind: "clip", momentMs: 20_000, label: "Rear wheel spin test" })]);
  });
});
