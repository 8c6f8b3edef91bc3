import { WEEKDAYS, WEEKDAY_LABEL, type OpeningHours as Hours } from "@/lib/shop-settings";

/** The week as the shop keeps it, on the shop's clock; nothing when the shop hasn't said. */
export function OpeningHours({ hours, timezone }: { hours: Hours | null; timezone: string }) {
  if (!hours) return null;
  return (
    <section aria-labelledby="hours-heading" className="space-y-2">
      <h2 id="hours-heading" className="text-xl font-bold text-ink">
        Opening hours
      </h2>
      <table className="text-ink">
        <caption className="sr-only">Opening hours, shop&apos;s local time ({timezone})</caption>
        <tbody>
          {WEEKDAYS.map((d) => {
            const day = hours[d];
            return (
              <tr key={d}>
                <th scope="row" className="py-1 pr-6 text-left font-semibold">
                  {WEEKDAY_LABEL[d]}
                </th>
                <td className="py-1">{day ? `${day.open}–${day.close}` : <span className="text-ink-muted">Closed</span>}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="text-sm text-ink-muted">Local time ({timezone.replace(/_/g, " ")})</p>
    </section>
  );
}
