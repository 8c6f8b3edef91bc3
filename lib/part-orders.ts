// Pure wording and rules for parts on order (issue 19): what the owner reads about a part on the
// way, and when a part on order counts as late. Dates are YYYY-MM-DD in the shop's calendar.

export type PartWait = { description: string; status: "ordered" | "back_ordered"; expectedOn: string | null };

/** Late: an expected date that has passed (the expected day itself isn't late yet). */
export function isLate(expectedOn: string | null, today: string): boolean {
  return expectedOn !== null && expectedOn < today;
}

/** One line per part the owner's cleared work waits on, saying plainly when it is expected. */
export function partWaitLines(waits: readonly PartWait[]): string[] {
  return waits.map((w) => {
    const when = w.expectedOn ? `expected ${w.expectedOn}` : "no date from the supplier yet";
    return w.status === "back_ordered" ? `Part on back-order: ${w.description}, ${when}.` : `Part on order: ${w.description}, ${when}.`;
  });
}
