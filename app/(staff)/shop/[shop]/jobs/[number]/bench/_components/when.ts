/** "Dec 3, 4:05 PM" on the shop's wall clock: the bench reads times where the shop is. */
export function whenText(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" }).format(new Date(iso));
}
