import "server-only";
import { dueInboxDigests, inboxDigestItems, latestInboxEventId, listInboxPreferences, lockInboxDigest, saveInboxDigest, shopsForInboxDigest } from "@/db/queries/inbox";
import { enqueueMail } from "@/db/queries/outbox";
import { transaction } from "@/db/transaction";
import { effectiveDeliveries } from "@/lib/inbox";
import { lastDailyCutoff } from "@/lib/following";
import type { StaffRole } from "@/lib/permissions";
import { INBOX_KINDS } from "@/lib/shop-events";
import { renderInboxDigestMail } from "@/lib/server/emails/inbox-email";
import { inboxLinks, mailItem, mayMailMoney, safeTimeZone } from "@/lib/server/inbox";

// The staff's morning e-mail of inbox items whose kind they set to "digest". Once per person and
// shop per day, at the shop's morning hour (INBOX_DIGEST_HOUR, default 7, in the shop's time
// zone), from the outbox worker's round. inbox_digests says how far each person's digest got:
// the row is locked, the mail queued and the row moved on in one transaction, so two workers or
// a crash mid-way never send a day's digest twice or skip items.

/** Items in one digest at most; past that the mail says more came in. */
const DIGEST_MAX = 50;
const DAY_MS = 24 * 60 * 60 * 1000;

export function inboxDigestHour(): number {
  const n = Number(process.env.INBOX_DIGEST_HOUR ?? 7);
  return Number.isInteger(n) && n >= 0 && n <= 23 ? n : 7;
}

/** The calendar day (YYYY-MM-DD) of `at` in `timeZone`. */
function dayIn(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(at);
}

type Shop = { id: number; name: string; slug: string; timezone: string };
type Person = { userId: number; email: string; role: StaffRole };

/** One person's digest for `day`: queued if anything is in it; the row moves on either way. Returns mails queued. */
async function sendDigest(shop: Shop, person: Person, day: string, cutoff: Date): Promise<number> {
  return transaction(async (tx) => {
    const state = await lockInboxDigest(tx, { shopId: shop.id, userId: person.userId });
    if (state.lastSentOn != null && state.lastSentOn >= day) return 0; // another worker got here first
    const deliveries = effectiveDeliveries(await listInboxPreferences({ shopId: shop.id, userId: person.userId }, tx));
    const kinds = INBOX_KINDS.filter((k) => deliveries[k] === "digest");
    const latest = await latestInboxEventId(tx, shop.id);
    // Someone new to the digest starts with the last day, not the shop's whole history.
    const since = state.fresh ? new Date(cutoff.getTime() - DAY_MS) : null;
    const items = await inboxDigestItems(tx, { shopId: shop.id, userId: person.userId, after: state.through, through: latest, kinds, since, limit: DIGEST_MAX + 1 });
    let queued = 0;
    if (items.length) {
      const money = mayMailMoney(person.role);
      const shown = items.slice(0, DIGEST_MAX).map((item) => mailItem(item, { ...shop, money }));
      const mail = await renderInboxDigestMail({ shopName: shop.name, day, items: shown, more: items.length > DIGEST_MAX, ...inboxLinks(shop.slug) });
      await enqueueMail(tx, { shopId: shop.id, kind: "inbox-digest", to: person.email, ...mail, replyTo: null, dedupeKey: `inbox-digest:${person.userId}:${day}` });
      queued = 1;
    }
    await saveInboxDigest(tx, { shopId: shop.id, userId: person.userId, through: Math.max(latest, state.through), sentOn: day });
    return queued;
  });
}

/**
 * One round: for every shop whose morning hour has come, each active staff member whose digest
 * for today isn't done gets it. One person's trouble is logged and retried next round.
 * `now` is for tests.
 */
export async function sweepInboxDigests({ now = new Date() }: { now?: Date } = {}): Promise<number> {
  const hour = inboxDigestHour();
  let queued = 0;
  for (const shop of await shopsForInboxDigest()) {
    const zone = safeTimeZone(shop.timezone);
    const cutoff = lastDailyCutoff(now, zone, hour);
    const day = dayIn(cutoff, zone);
    for (const person of await dueInboxDigests({ shopId: shop.id, day })) {
      try {
        queued += await sendDigest(shop, person, day, cutoff);
      } catch (error) {
        console.error(`inbox: the digest of user ${person.userId} in shop ${shop.id} failed; it is tried again next round`, error);
      }
    }
  }
  return queued;
}
