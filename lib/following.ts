// Following a job: who gets e-mail about it and how often. Pure: no I/O. The forms' schemas are
// in lib/schemas/following.ts, so the owner's page can import this module without zod.

export const SUBSCRIBER_ROLES = ["owner", "follower"] as const;
export type SubscriberRole = (typeof SUBSCRIBER_ROLES)[number];

export const FREQUENCIES = ["every", "daily", "decisions"] as const;
export type Frequency = (typeof FREQUENCIES)[number];

export const FREQUENCY_LABEL: Record<Frequency, string> = {
  every: "Every update",
  daily: "Once a day",
  decisions: "Only pick-up and approvals",
};
export const FREQUENCY_HINT: Record<Frequency, string> = {
  every: "Updates shared close together come as one e-mail.",
  daily: "One e-mail in the evening with the day's updates.",
  decisions: "Only when the machine is ready to collect or the shop asks for an OK.",
};

/** Mail that goes out at once to every subscriber, whatever their frequency (invitations go to one person). */
export const ALERT_KINDS = ["ready", "approval_request", "invitation", "parts_in"] as const;
export type AlertKind = (typeof ALERT_KINDS)[number];

/** Enough for family and a riding club; few enough that a job can't become a mailing list. */
export const MAX_FOLLOWERS = 20;

/**
 * The most recent daily-digest moment (`hour`:00 on the shop's clock) at or before `now`.
 * Entries shared before it and not yet in a digest go in the next one, so a subscriber gets at
 * most one digest a day whatever the traffic. Near a clock change the moment may be an hour off.
 */
export function lastDailyCutoff(now: Date, timeZone: string, hour: number): Date {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(now);
  const get = (type: Intl.DateTimeFormatPartTypes) => Number(parts.find((p) => p.type === type)?.value);
  const wallClock = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  const offset = wallClock - Math.floor(now.getTime() / 1000) * 1000;
  let cutoff = Date.UTC(get("year"), get("month") - 1, get("day"), hour, 0, 0);
  if (get("hour") < hour) cutoff -= 24 * 60 * 60 * 1000;
  return new Date(cutoff - offset);
}
