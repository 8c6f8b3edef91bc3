// Which safety cautions a person has already seen on which page (issue 20 §3): a caution shows in
// full the first time, and on later visits to the same page folds to its title and the deferral,
// one tap from the full text. Kept in the browser (localStorage), per page and caution, as one JSON
// map of "page#caution" → when it was seen, the newest CAUTIONS_SEEN_CAP only. Pure: no storage here.

export const CAUTIONS_SEEN_KEY = "benchside:cautions-seen";
export const CAUTIONS_SEEN_CAP = 300;

export type SeenMap = Readonly<Record<string, number>>;

/** The key of one caution on one page. The page is its path: each job's bench page counts on its own. */
export function cautionKey(pathname: string, id: string): string {
  const page = pathname.length > 1 ? pathname.replace(/\/+$/, "") : pathname;
  return `${page}#${id}`;
}

/** Reads what was stored; anything unreadable (junk, another shape, bad times) reads as nothing seen. */
export function parseSeen(raw: string | null): SeenMap {
  if (!raw) return {};
  let data: unknown;
  try {
    data = JSON.parse(raw);
  } catch {
    return {};
  }
  if (!data || typeof data !== "object" || Array.isArray(data)) return {};
  const out: Record<string, number> = {};
  for (const [key, at] of Object.entries(data)) {
    if (typeof at === "number" && Number.isFinite(at) && at >= 0) out[key] = at;
  }
  return out;
}

export function hasSeen(seen: SeenMap, key: string): boolean {
  return Object.prototype.hasOwnProperty.call(seen, key);
}

/** The map with `key` seen at `now`, keeping the `cap` most recently seen (older pages fall out and show in full again). */
export function withSeen(seen: SeenMap, key: string, now: number, cap = CAUTIONS_SEEN_CAP): SeenMap {
  const entries = Object.entries({ ...seen, [key]: now }).sort((a, b) => b[1] - a[1]);
  return Object.fromEntries(entries.slice(0, Math.max(1, cap)));
}
