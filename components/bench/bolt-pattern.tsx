import clsx from "clsx";
import { AppError } from "@/lib/errors";
import { boltPositions } from "@/lib/tightening-order";

export type BoltPatternProps = {
  /** Bolts on the circle, numbered 1…count clockwise from the top. */
  count: number;
  /** Bolt numbers in tightening order, e.g. from crossPatternOrder(count). */
  order: readonly number[];
  /** Widest the drawing grows, in CSS px; it shrinks to fit narrower screens. */
  size?: number;
  className?: string;
};

// Drawn in a fixed 240-unit box and scaled by the browser, so one layout serves every width.
const BOX = 240;
const CENTRE = BOX / 2;
const BOLT_CIRCLE = 88;

const round = (n: number) => Math.round(n * 100) / 100;

function assertPermutation(count: number, order: readonly number[]): void {
  const sorted = [...order].sort((a, b) => a - b);
  if (sorted.length !== count || sorted.some((bolt, i) => bolt !== i + 1)) {
    throw new AppError("invalid", `The tightening order must list each bolt 1–${count} exactly once.`);
  }
}

/**
 * A bolt circle the technician can follow on a phone: the big filled badge at each bolt is its
 * step in the order, the small number inside the circle is the bolt's position. No hooks, so it
 * renders on the server.
 */
export function BoltPattern({ count, order, size = 280, className }: BoltPatternProps) {
  const positions = boltPositions(count, BOLT_CIRCLE, CENTRE, CENTRE);
  assertPermutation(count, order);
  const stepOf = new Map(order.map((bolt, i) => [bolt, i + 1]));

  // Badges as large as the gap between neighbouring bolts allows without touching, capped for small counts.
  const badge = Math.min(15, ((Math.PI * BOLT_CIRCLE) / count) * 0.85);
  const stepFont = round(badge * (count > 9 ? 0.95 : 1.1));
  const labelRadius = BOLT_CIRCLE - badge - 10;
  const labelFont = round(Math.max(6, Math.min(11, badge * 0.75)));
  const labels = boltPositions(count, labelRadius, CENTRE, CENTRE);

  return (
    <figure className={clsx("flex flex-col items-center gap-2", className)}>
      <svg
        role="img"
        aria-label={`Tightening order: ${order.join(", ")}`}
        viewBox={`0 0 ${BOX} ${BOX}`}
        className="h-auto w-full text-ink"
        style={{ maxWidth: size }}
      >
        {/* Flange outline and the bolt circle the badges sit on. */}
        <circle cx={CENTRE} cy={CENTRE} r={BOX / 2 - 4} className="fill-surface stroke-line-strong" strokeWidth={2} />
        <circle
          cx={CENTRE}
          cy={CENTRE}
          r={BOLT_CIRCLE}
          fill="none"
          stroke="currentColor"
          strokeWidth={1}
          strokeDasharray="4 4"
          className="text-ink-muted"
        />
        {positions.map(({ bolt, x, y }, i) => {
          const label = labels[i]!;
          return (
            <g key={bolt}>
              <circle cx={round(x)} cy={round(y)} r={round(badge)} className="fill-oil stroke-ink" strokeWidth={1.5} />
              <text
                x={round(x)}
                y={round(y)}
                textAnchor="middle"
                dominantBaseline="central"
                fontSize={stepFont}
                className="fill-oil-on font-bold"
              >
                {stepOf.get(bolt)}
              </text>
              <text
                x={round(label.x)}
                y={round(label.y)}
                textAnchor="middle"
                dominantBaseline="central"
                fontSize={labelFont}
                className="fill-ink-muted"
              >
                {bolt}
              </text>
            </g>
          );
        })}
      </svg>
      <figcaption className="max-w-prose text-center text-sm text-ink-muted">
        Filled badges: tightening step. Small numbers: bolt position, clockwise from the top.
        <span className="mt-1 block font-semibold text-ink">
          The maker&apos;s sequence and values override this generated pattern.
        </span>
      </figcaption>
    </figure>
  );
}
