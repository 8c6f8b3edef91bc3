// Demo times: relative to now, so the demo always looks like a working week in progress.
export const HOUR = 3_600_000;
/**
 * A moment `days` from now at `hour` UTC (15:00 UTC is morning in both demo shops' zones),
 * never later than a minute ago: history can't be in the future.
 */
export const daysFromNow = (days: number, hour = 15) => {
  const d = new Date();
  d.setUTCDate(d.getUTCDate() + days);
  d.setUTCHours(hour, 0, 0, 0);
  return days <= 0 ? new Date(Math.min(d.getTime(), Date.now() - HOUR / 60)) : d;
};

/** The calendar date `days` from today on the shop's wall (YYYY-MM-DD), as the board compares it. */
export const calendarDay = (days: number, timeZone: string) => new Intl.DateTimeFormat("en-CA", { timeZone }).format(new Date(Date.now() + days * 24 * HOUR));
