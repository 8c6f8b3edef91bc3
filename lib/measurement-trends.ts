// Trends of structured measurements across the jobs of one machine (issue 18 §5): the same valve,
// plate or cylinder over time, and the geometry of the small inline SVG that draws it on the
// machine's page (server-rendered; no chart library reaches the browser). Pure.
import type { ReadingVerdict } from "@/lib/readings";
import { type ItemLimit, MEASUREMENT_KIND_INFO, type MeasurementKind, type Typed } from "@/lib/measurements";

export type TrendPoint = { jobNumber: number; at: string; value: Typed; verdict: ReadingVerdict; limit: ItemLimit };
export type Trend = { kind: MeasurementKind; key: string; label: string; unit: string; points: TrendPoint[] };

/** Rows (any order) → one trend per kind, item and unit, oldest point first; only items seen on two or more jobs draw a line. */
export function groupTrends(rows: readonly (TrendPoint & { kind: MeasurementKind; key: string; label: string; unit: string })[]): Trend[] {
  const map = new Map<string, Trend>();
  for (const r of rows) {
    const id = `${r.kind}|${r.key}|${r.unit}`;
    const t = map.get(id) ?? { kind: r.kind, key: r.key, label: `${MEASUREMENT_KIND_INFO[r.kind].title}: ${r.label}`, unit: r.unit, points: [] };
    t.points.push({ jobNumber: r.jobNumber, at: r.at, value: r.value, verdict: r.verdict, limit: r.limit });
    map.set(id, t);
  }
  const trends = [...map.values()];
  for (const t of trends) t.points.sort((a, b) => a.at.localeCompare(b.at) || a.jobNumber - b.jobNumber);
  return trends.filter((t) => new Set(t.points.map((p) => p.jobNumber)).size >= 2).sort((a, b) => a.kind.localeCompare(b.kind) || a.label.localeCompare(b.label));
}

/** An SVG polyline's points for the values, scaled into width × height with a pad; limits widen the range so they can be drawn. */
export function sparkline(values: readonly number[], limits: readonly number[], width: number, height: number, pad = 4): { points: string; y: (v: number) => number } {
  const all = [...values, ...limits];
  const lo = Math.min(...all);
  const hi = Math.max(...all);
  const span = hi - lo || 1;
  const y = (v: number) => Number((height - pad - ((v - lo) / span) * (height - 2 * pad)).toFixed(2));
  const step = values.length > 1 ? (width - 2 * pad) / (values.length - 1) : 0;
  const points = values.map((v, i) => `${Number((pad + i * step).toFixed(2))},${y(v)}`).join(" ");
  return { points, y };
}
