"use client";
import clsx from "clsx";
import { Check, X } from "lucide-react";
import { LINE_KIND_LABEL, type LineAnswer, type RequestSnapshot } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import { lineDetail } from "./request-lines";

const choice =
  "flex min-h-tap flex-1 cursor-pointer items-center justify-center gap-2 rounded-lg border-2 px-3 py-2 font-semibold has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-brass";

/** One approve/decline choice per line, as big radio buttons (a thumb, not a fingertip). */
export function LineAnswers({
  snapshot,
  answers,
  onChange,
  errors,
  idPrefix,
}: {
  snapshot: RequestSnapshot;
  answers: Partial<Record<number, LineAnswer>>;
  onChange: (no: number, answer: LineAnswer) => void;
  errors?: Record<string, string[]>;
  idPrefix: string;
}) {
  return (
    <ul className="space-y-3" aria-label="Lines to answer">
      {snapshot.lines.map((line) => {
        const error = errors?.[`lines.${line.no}`]?.[0];
        const name = `${idPrefix}-line-${line.no}`;
        return (
          <li key={line.no}>
            <fieldset className={clsx("rounded-xl border bg-surface p-4", error ? "border-2 border-rust" : "border-line")} aria-describedby={error ? `${name}-error` : undefined}>
              <legend className="sr-only">{`${line.description}, ${formatMoney(line.netMinor, snapshot.currency)}${lineDetail(line, snapshot.currency) ? ` (${lineDetail(line, snapshot.currency)})` : ""}`}</legend>
              <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2" aria-hidden>
                <span className="font-semibold text-ink">{line.description}</span>
                <span className="font-bold tabular-nums text-ink">{formatMoney(line.netMinor, snapshot.currency)}</span>
                <span className="w-full text-sm text-ink-muted">{lineDetail(line, snapshot.currency) || LINE_KIND_LABEL.fee}</span>
              </div>
              <div className="flex gap-2">
                <label className={clsx(choice, answers[line.no] === "approved" ? "border-moss bg-moss text-moss-on" : "border-line-strong bg-surface text-ink")}>
                  <input type="radio" className="sr-only" name={name} value="approved" checked={answers[line.no] === "approved"} onChange={() => onChange(line.no, "approved")} />
                  <Check aria-hidden className="size-5" />
                  Approve
                </label>
                <label className={clsx(choice, answers[line.no] === "declined" ? "border-rust bg-rust text-rust-on" : "border-line-strong bg-surface text-ink")}>
                  <input type="radio" className="sr-only" name={name} value="declined" checked={answers[line.no] === "declined"} onChange={() => onChange(line.no, "declined")} />
                  <X aria-hidden className="size-5" />
                  Decline
                </label>
              </div>
              {error ? (
                <p id={`${name}-error`} className="mt-2 text-sm font-medium text-rust">
                  {error}
                </p>
              ) : null}
            </fieldset>
          </li>
        );
      })}
    </ul>
  );
}
