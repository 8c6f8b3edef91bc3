/**
 * A small line of one kind of reading over time (oldest left), beside its table. Decorative: the
 * table carries the values, so the drawing is hidden from screen readers. Dates are spaced by
 * time, not by row, so a long gap between visits shows as one.
 */
export function ReadingTrend({ points }: { points: { at: Date; value: number }[] }) {
  if (points.length < 2) return null;
  const W = 240;
  const H = 64;
  const PAD = 6;
  const times = points.map((p) => p.at.getTime());
  const values = points.map((p) => p.value);
  const [t0, t1] = [Math.min(...times), Math.max(...times)];
  const [v0, v1] = [Math.min(...values), Math.max(...values)];
  const x = (t: number) => PAD + (t1 === t0 ? 0.5 : (t - t0) / (t1 - t0)) * (W - 2 * PAD);
  const y = (v: number) => H - PAD - (v1 === v0 ? 0.5 : (v - v0) / (v1 - v0)) * (H - 2 * PAD);
  const sorted = [...points].sort((a, b) => a.at.getTime() - b.at.getTime());
  const path = sorted.map((p, i) => `${i ? "L" : "M"}${x(p.at.getTime()).toFixed(1)},${y(p.value).toFixed(1)}`).join(" ");
  return (
    <svg aria-hidden="true" focusable="false" viewBox={`0 0 ${W} ${H}`} className="h-16 w-full max-w-xs text-oil">
      <path d={path} fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" />
      {sorted.map((p, i) => (
        <circle key={i} cx={x(p.at.getTime())} cy={y(p.value)} r="3" fill="currentColor" />
      ))}
    </svg>
  );
}
