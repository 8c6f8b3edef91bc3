import "server-only";
import { enqueueMail } from "@/db/queries/outbox";
import {
  type StoryRow,
  consentedHash,
  countItems,
  getStory,
  getStoryForJob,
  insertConsent,
  insertStory,
  latestConsent,
  listItems,
  lockStory,
  moveStory,
  slugTaken,
} from "@/db/queries/portfolio";
import { getShopName } from "@/db/queries/shops";
import { AppError } from "@/lib/errors";
import { describeMachine } from "@/lib/machine";
import type { Actor } from "@/lib/permissions";
import { CONSENT_FROM, CONSENT_TO, type ConsentDecision, PUBLISHABLE_FROM, type StoryStatus, isReservedSlug, slugify } from "@/lib/portfolio";
import type { InboxKind } from "@/lib/shop-events";
import { appUrl } from "@/lib/server/config";
import { recordInboxEvent } from "@/lib/server/inbox";
import { type Tx, transaction } from "@/db/transaction";
import { canonicalJson } from "@/lib/approvals";
import { sha256Hex } from "@/lib/server/approval-hash";
import { renderConsentMail } from "@/lib/server/emails/portfolio-consent";
import { curationProblems } from "@/lib/server/portfolio-curation";
import type { JobAccess, Resolved } from "@/lib/server/access";

// Proposing a finished job, the machine owner's consent (given, refused, withdrawn) and the shop
// owner's publish / take-down. Each gets its resource found and authorised by the caller's declaration (lib/server/access.ts),
// then runs in one transaction. Pages and
// caches are refreshed by the server actions that call these (app/…/actions.ts).

/** Where the owner answers (linked from the e-mail and the owner's job page). */
export const consentPath = (jobPublicId: string) => `/my/jobs/${jobPublicId}/portfolio`;

const NOT_ASKED = "The shop hasn't asked to show this job.";

async function uniqueSlug(shopId: number, base: string): Promise<string> {
  const slugged = slugify(base).slice(0, 72);
  const root = isReservedSlug(slugged) ? `${slugged.slice(0, 66)}-story` : slugged;
  for (let n = 1; n < 50; n++) {
    const slug = n === 1 ? root : `${root}-${n}`;
    if (!(await slugTaken({ shopId, slug }))) return slug;
  }
  return `${root}-${Date.now().toString(36)}`;
}

/**
 * Staff propose a collected job for the portfolio. Nothing is asked yet: the shop writes the
 * story first, so the owner is asked about the write-up as the public would see it (askOwner).
 * Proposing twice returns the story already there.
 */
export async function proposeStory(actor: Actor, { job }: JobAccess): Promise<{ story: StoryRow; created: boolean }> {
  const existing = await getStoryForJob({ shopId: job.shopId, jobId: job.id });
  if (existing) return { story: existing, created: false };
  if (job.status !== "picked_up") throw new AppError("conflict", "Only jobs the owner has collected can go in the portfolio.");
  const machine = describeMachine(job.machine);
  const slug = await uniqueSlug(job.shopId, machine);
  let storyId = 0;
  try {
    storyId = await transaction((tx) => insertStory(tx, { shopId: job.shopId, jobId: job.id, slug, title: machine, status: "proposed", proposedBy: actor.userId }));
  } catch (error) {
    // Two people proposing at once: the unique (shop, job) key lets one through.
    if ((error as { code?: string }).code !== "ER_DUP_ENTRY") throw error;
  }
  const story = await getStoryForJob({ shopId: job.shopId, jobId: job.id });
  if (!story) throw new AppError("internal", "The story wasn't saved.");
  return { story, created: story.id === storyId };
}

/**
 * SHA-256 of the story's curated content (title, address, write-up, cover and items with their
 * captions): what the owner is shown and agrees to. The shared entries themselves are the owner's
 * own job journal, already in front of them.
 */
export async function storyContentHash(story: Pick<StoryRow, "shopId" | "id" | "title" | "slug" | "writeUp" | "coverPhotoId">, k?: Tx): Promise<string> {
  const items = await listItems({ shopId: story.shopId, storyId: story.id }, k);
  return sha256Hex(canonicalJson({ title: story.title, slug: story.slug, writeUp: story.writeUp ?? null, cover: story.coverPhotoId, items }));
}

async function queueConsentMail(
  tx: Parameters<typeof enqueueMail>[0],
  m: { shopId: number; shopName: string; to: string; ownerName: string; machine: string; jobPublicId: string; storyId: number; hash: string },
) {
  const mail = await renderConsentMail({ shopName: m.shopName, ownerName: m.ownerName, machine: m.machine, answerUrl: `${appUrl()}${consentPath(m.jobPublicId)}` });
  await enqueueMail(tx, { shopId: m.shopId, jobPublicId: m.jobPublicId, kind: "portfolio-consent", to: m.to, ...mail, dedupeKey: `portfolio-consent:${m.storyId}:${m.hash.slice(0, 16)}` });
}

/**
 * Asks the owner, by e-mail through the outbox, to agree to the write-up as it stands. Needs
 * something to show and nothing private in the words; the mail is sent once per version of the
 * content (asking again about the same words queues nothing new).
 */
export async function askOwner({ story }: Resolved<"story">): Promise<StoryRow> {
  const storyId = story.id;
  if (story.status !== "proposed") throw new AppError("conflict", "The owner has already been asked; their answer shows on this page.");
  if (!story.customer.email) throw new AppError("conflict", "The owner has no e-mail address on file. Add one to their record, then ask.");
  const problems = await curationProblems(story);
  if (problems) throw new AppError("invalid", `Fix the write-up before asking: ${problems}`);
  await transaction(async (tx) => {
    if ((await countItems(tx, { shopId: story.shopId, storyId })) === 0) throw new AppError("conflict", "Add at least one photo, clip or record first: the owner agrees to the story as the public will see it.");
    if (!(await moveStory({ shopId: story.shopId, storyId, from: ["proposed"], to: "consent_requested" }, tx))) throw new AppError("conflict", "This story changed meanwhile; reload the page.");
    await queueAsk(tx, story, await storyContentHash(story, tx));
  });
  return (await getStory({ shopId: story.shopId, storyId }))!;
}

async function queueAsk(tx: Tx, story: StoryRow, hash: string) {
  if (!story.customer.email) return;
  const shopName = await getShopName({ shopId: story.shopId }, tx);
  await queueConsentMail(tx, { shopId: story.shopId, shopName, to: story.customer.email, ownerName: story.customer.name, machine: describeMachine(story.machine), jobPublicId: story.jobPublicId, storyId: story.id, hash });
}

/**
 * After the shop saves the curation: when the owner had agreed to other words, their consent no
 * longer covers the story. It goes back to waiting on them (off the public site if it was on it)
 * and they are asked again about the new version.
 */
export async function reaskIfChanged(story: StoryRow): Promise<boolean> {
  return transaction(async (tx) => {
    const locked = await lockStory(tx, { shopId: story.shopId, storyId: story.id });
    if (!locked || !CONSENT_FROM.withdrawn.includes(locked.status)) return false;
    const now = (await getStory({ shopId: story.shopId, storyId: story.id }, tx))!;
    const hash = await storyContentHash(now, tx);
    if ((await consentedHash(tx, { shopId: story.shopId, storyId: story.id })) === hash) return false;
    await moveStory({ shopId: story.shopId, storyId: story.id, from: [locked.status], to: "consent_requested" }, tx);
    await queueAsk(tx, now, hash);
    return true;
  });
}

const CONSENT_REFUSALS: Partial<Record<StoryStatus, string>> = {
  consented: "You've already agreed. You can withdraw your consent below.",
  published: "You've already agreed and the story is public. You can withdraw your consent below.",
  unpublished: "You've already agreed. You can withdraw your consent below.",
  declined: "You've already said no. You can still change your mind and agree.",
  withdrawn: "You've withdrawn your consent. You can still change your mind and agree.",
  consent_requested: "You haven't agreed yet, so there is nothing to withdraw.",
  proposed: "You haven't agreed yet, so there is nothing to withdraw.",
};

/**
 * The machine owner's answer: given, refused or withdrawn, with the name they typed, when, from
 * which address and browser. Recorded and applied in one transaction on the locked story row,
 * so a withdrawal and a publish can't cross: withdrawn means offline from this commit on.
 */
export async function decideConsent(
  actor: Actor,
  { job }: JobAccess,
  input: { decision: ConsentDecision; name: string; shownHash?: string | null },
  meta: { ip: string; userAgent: string | null },
): Promise<{ story: StoryRow; status: StoryStatus }> {
  const story = await getStoryForJob({ shopId: job.shopId, jobId: job.id });
  if (!story) throw new AppError("not_found", NOT_ASKED);
  const name = input.name.trim();
  if (!name) throw new AppError("invalid", "Type your name to sign your answer.", { name: ["Type your name to sign your answer."] });
  const to = CONSENT_TO[input.decision];
  await transaction(async (tx) => {
    const locked = await lockStory(tx, { shopId: story.shopId, storyId: story.id });
    if (!locked) throw new AppError("not_found", NOT_ASKED);
    if (!CONSENT_FROM[input.decision].includes(locked.status)) throw new AppError("conflict", CONSENT_REFUSALS[locked.status] ?? "That answer doesn't apply now; reload the page.");
    let shownHash: string | null = null;
    if (input.decision === "given") {
      // Agreeing is to the words shown: if the shop changed them since the page was opened, read them again.
      shownHash = await storyContentHash((await getStory({ shopId: story.shopId, storyId: story.id }, tx))!, tx);
      if (input.shownHash !== shownHash) throw new AppError("conflict", "The shop changed the story since you opened this page. Read it again below, then answer.");
    }
    await insertConsent(tx, { shopId: story.shopId, storyId: story.id, userId: actor.userId, name, decision: input.decision, ip: meta.ip, userAgent: meta.userAgent, shownHash });
    await moveStory({ shopId: story.shopId, storyId: story.id, from: [locked.status], to }, tx);
    await recordInboxEvent(tx, {
      shopId: story.shopId,
      jobId: story.jobId,
      kind: CONSENT_INBOX_KIND[input.decision],
      actorUserId: actor.userId,
      summary: `${name} ${CONSENT_INBOX_WORDS[input.decision]} "${story.title}"`,
      extra: { story: story.id, name },
    });
  });
  return { story, status: to };
}

const CONSENT_INBOX_KIND = { given: "consent_given", refused: "consent_refused", withdrawn: "consent_withdrawn" } as const satisfies Record<ConsentDecision, InboxKind>;
const CONSENT_INBOX_WORDS: Record<ConsentDecision, string> = {
  given: "agreed to the public story",
  refused: "said no to the public story",
  withdrawn: "withdrew consent for the public story",
};

const PUBLISH_REFUSALS: Partial<Record<StoryStatus, string>> = {
  proposed: "The owner hasn't been asked yet: nothing is published without their consent.",
  consent_requested: "The owner hasn't answered yet: nothing is published without their consent.",
  declined: "The owner said no: this story can't be published.",
  withdrawn: "The owner withdrew consent: this story can't be published.",
  published: "This story is already public.",
};

/** The shop owner publishes, only with the machine owner's standing consent and nothing private in the words. */
export async function publishStory(actor: Actor, { story }: Resolved<"story">): Promise<StoryRow> {
  const storyId = story.id;
  const problems = await curationProblems(story);
  if (problems) throw new AppError("invalid", `This story can't go public yet: ${problems}`);
  await transaction(async (tx) => {
    const locked = await lockStory(tx, { shopId: story.shopId, storyId });
    if (!locked || !PUBLISHABLE_FROM.includes(locked.status)) throw new AppError("conflict", PUBLISH_REFUSALS[locked?.status ?? "proposed"] ?? "This story can't be published now.");
    // The status says consent was given; the record must say so too.
    if ((await latestConsent(tx, { shopId: story.shopId, storyId })) !== "given") throw new AppError("conflict", PUBLISH_REFUSALS.consent_requested!);
    if ((await countItems(tx, { shopId: story.shopId, storyId })) === 0) throw new AppError("conflict", "Add at least one photo, clip or record to the story before publishing it.");
    const agreed = await consentedHash(tx, { shopId: story.shopId, storyId });
    if (agreed !== (await storyContentHash((await getStory({ shopId: story.shopId, storyId }, tx))!, tx))) {
      throw new AppError("conflict", "The story isn't the version the owner agreed to. Save it to ask them about this version.");
    }
    await moveStory({ shopId: story.shopId, storyId, from: PUBLISHABLE_FROM, to: "published", publishedBy: actor.userId }, tx);
  });
  return (await getStory({ shopId: story.shopId, storyId }))!;
}

/** Takes a public story down (the owner's consent stands; it can be published again). */
export async function unpublishStory({ story }: Resolved<"story">): Promise<StoryRow> {
  const storyId = story.id;
  if (!(await moveStory({ shopId: story.shopId, storyId, from: ["published"], to: "unpublished" }))) throw new AppError("conflict", "This story isn't public.");
  return (await getStory({ shopId: story.shopId, storyId }))!;
}
