import "server-only";
import { countUnread, listInbox, listInboxPreferences, markAllRead, markRead, saveInboxPreferences } from "@/db/queries/inbox";
import { AppError } from "@/lib/errors";
import { INBOX_PAGE_SIZE, type InboxPage, effectiveDeliveries } from "@/lib/inbox";
import { stripMoney } from "@/lib/money-fields";
import { type Actor, type Resource, can } from "@/lib/permissions";
import type { InboxQuery } from "@/lib/schemas/inbox";
import type { Delivery, InboxKind } from "@/lib/shop-events";

// The desk inbox as one staff member reads and works it: their read flags, their unread count,
// their e-mail choices. Amounts leave only for staff who may see money ("money:view").

type ShopAccess = { shop: { id: number }; resource: Resource };

/** One page of the inbox with this person's unread count; amounts stripped for who may not see them. */
export async function inboxPageFor(actor: Actor, { shop, resource }: ShopAccess, query: InboxQuery): Promise<InboxPage> {
  const reader = { shopId: shop.id, userId: actor.userId };
  const [list, unread] = await Promise.all([
    listInbox({ ...reader, kinds: query.kind, jobNumber: query.job, before: query.before, unreadOnly: query.unread, limit: INBOX_PAGE_SIZE }),
    countUnread(reader),
  ]);
  const page: InboxPage = { ...list, unread };
  return can(actor, "money:view", resource) ? page : stripMoney(page);
}

export async function unreadCountFor(actor: Actor, { shop }: ShopAccess): Promise<number> {
  return countUnread({ shopId: shop.id, userId: actor.userId });
}

export async function markItemRead(actor: Actor, { shop }: ShopAccess, item: number): Promise<void> {
  if (!(await markRead({ shopId: shop.id, userId: actor.userId, eventId: item }))) throw new AppError("not_found", "No such item in this shop's inbox.");
}

/** Everything up to `through` that matches the filter the reader was looking at. */
export async function markAllItemsRead(actor: Actor, { shop }: ShopAccess, p: { through: number; kinds: InboxKind[]; jobNumber?: number }): Promise<number> {
  return markAllRead({ shopId: shop.id, userId: actor.userId, through: p.through, kinds: p.kinds, jobNumber: p.jobNumber });
}

export async function inboxSettingsFor(actor: Actor, { shop, resource }: ShopAccess) {
  return { deliveries: effectiveDeliveries(await listInboxPreferences({ shopId: shop.id, userId: actor.userId })), mayViewMoney: can(actor, "money:view", resource) };
}

export async function saveInboxSettings(actor: Actor, { shop }: ShopAccess, choices: Record<InboxKind, Delivery>): Promise<void> {
  await saveInboxPreferences({ shopId: shop.id, userId: actor.userId, choices });
}
