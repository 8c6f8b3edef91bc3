import "server-only";
import { cache } from "react";
import { getMoneySettings } from "@/db/queries/findings";
import { getJobByNumber, getJobByPublicId } from "@/db/queries/jobs";
import { getShopBySlug } from "@/db/queries/shops";
import { authorisedWork } from "@/lib/server/authorised-work";

// Rows several parts of one page read: React's `cache`, so a server render (the staff layout and
// the page under it, a page and its cards) reads each once. Scoped to one render: the next
// request reads afresh. Outside a render (route handlers, server actions, tests) every call
// reads, so nothing is kept across a write. Callers must not mutate what they get.

export const shopBySlug = cache((slug: string) => getShopBySlug({ slug }));

export const jobByNumber = cache((shopId: number, number: number) => getJobByNumber({ shopId, number }));

export const jobByPublicId = cache((publicId: string) => getJobByPublicId({ publicId }));

/** The staff job page's drop-off card and approvals panel both price with these. */
export const moneySettingsOf = cache((shopId: number) => getMoneySettings({ shopId }));

/** What the owner has authorised on a job (requests, decisions, drop-off): the owner's page, its drop-off notice and its invoice card. */
export const authorisedWorkOf = cache((shopId: number, jobId: number) => authorisedWork({ shopId, jobId }));
