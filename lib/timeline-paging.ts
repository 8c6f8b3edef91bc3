/**
 * Entries in one page of a job's timeline: what a job page renders on the server and hands to
 * SWR, and what each "Show older entries" adds through the timeline API. Small, so the first
 * paint stays light; the API's own default (lib/journal.ts) is for other callers.
 */
export const TIMELINE_PAGE_SIZE = 20;
