"use client";
import clsx from "clsx";
import type { EvidenceChoices } from "@/db/queries/findings";
import { PhotoImg } from "@/components/journal/photo-img";
import { Input, Select } from "@/components/ui";
import { formatDuration, momentAt } from "@/lib/clips";
import { readingLine } from "@/lib/reading-text";
import type { EvidenceState } from "./form-state";

type Props = { choices: EvidenceChoices; value: EvidenceState[]; onChange: (v: EvidenceState[]) => void; errors: Record<string, string[]>; disabled: boolean };

/** "1:05" or "65" → 65 000 ms; null for blank or unreadable text. */
export function readMoment(text: string): number | null {
  const m = /^\s*(?:(\d{1,3}):)?(\d{1,5})\s*$/.exec(text);
  if (!m) return null;
  return ((m[1] ? Number(m[1]) * 60 : 0) + Number(m[2])) * 1000;
}

/** Pick the job's own photos, readings and clip moments as the finding's evidence. */
export function EvidencePicker({ choices, value, onChange, errors, disabled }: Props) {
  const has = (kind: EvidenceState["kind"], ref: string) => value.some((e) => e.kind === kind && e.ref === ref);
  const toggle = (kind: EvidenceState["kind"], ref: string, on: boolean) => onChange(on ? [...value, { kind, ref, momentMs: null }] : value.filter((e) => !(e.kind === kind && e.ref === ref)));
  const problem = Object.entries(errors).find(([k]) => k.startsWith("evidence"))?.[1][0];
  const none = !choices.photos.length && !choices.readings.length && !choices.clips.length;
  return (
    <fieldset className="space-y-3" disabled={disabled}>
      <legend className="mb-2 text-lg font-bold text-ink">Evidence</legend>
      {problem ? <p className="font-medium text-rust">{problem}</p> : null}
      {none ? <p className="text-ink-muted">Post photos to the journal or record a reading on the bench page, then pick them here.</p> : null}
      {choices.photos.length ? (
        <ul className="grid grid-cols-3 gap-2 sm:grid-cols-5" aria-label="Photos of this job">
          {choices.photos.map((p, i) => (
            <li key={p.id}>
              <label className={clsx("relative block cursor-pointer overflow-hidden rounded-lg border-4 has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-brass", has("photo", p.id) ? "border-oil" : "border-transparent")}>
                <input type="checkbox" className="absolute left-2 top-2 size-6 accent-oil" checked={has("photo", p.id)} onChange={(e) => toggle("photo", p.id, e.target.checked)} aria-label={`Photo ${i + 1}${p.caption ? `: ${p.caption}` : ""}`} />
                <PhotoImg photo={p} alt="" sizes="(min-width: 1152px) 220px, (min-width: 640px) 20vw, 33vw" className="aspect-square w-full object-cover" />
              </label>
            </li>
          ))}
        </ul>
      ) : null}
      {choices.readings.length ? (
        <ul className="space-y-1" aria-label="Readings of this job">
          {choices.readings.map((r) => (
            <li key={r.id}>
              <label className="flex min-h-tap cursor-pointer items-center gap-3 text-ink">
                <input type="checkbox" className="size-5 accent-oil" checked={has("reading", r.id)} onChange={(e) => toggle("reading", r.id, e.target.checked)} />
                Reading: {readingLine(r)}
              </label>
            </li>
          ))}
        </ul>
      ) : null}
      {choices.clips.length ? (
        <ul className="space-y-2" aria-label="Clips of this job">
          {choices.clips.map((c, i) => {
            const chosen = value.find((e) => e.kind === "clip" && e.ref === c.id);
            return (
              <li key={c.id} className="flex flex-wrap items-center gap-3">
                <label className="flex min-h-tap cursor-pointer items-center gap-3 text-ink">
                  <input type="checkbox" className="size-5 accent-oil" checked={!!chosen} onChange={(e) => toggle("clip", c.id, e.target.checked)} />
                  Clip {i + 1}
                  {c.caption ? `: ${c.caption}` : ""}
                </label>
                {chosen && c.moments.length ? (
                  // The technician's marked moments, caption and all: picked, not retyped (the owner reads the caption).
                  <label className="flex items-center gap-2 text-ink">
                    Marked moment
                    <Select
                      className="w-auto"
                      value={momentAt(c.moments, chosen.momentMs) ? String(momentAt(c.moments, chosen.momentMs)!.atMs) : ""}
                      onChange={(e) => onChange(value.map((v) => (v === chosen ? { ...v, momentMs: e.target.value === "" ? null : Number(e.target.value) } : v)))}
                    >
                      <option value="">{chosen.momentMs == null ? "None: the whole clip" : "Another time (typed)"}</option>
                      {c.moments.map((m) => (
                        <option key={`${m.atMs}-${m.label}`} value={m.atMs}>
                          {formatDuration(m.atMs / 1000)} {m.label}
                        </option>
                      ))}
                    </Select>
                  </label>
                ) : null}
                {chosen ? (
                  <label className="flex items-center gap-2 text-ink">
                    At
                    <Input
                      key={`at-${chosen.momentMs ?? ""}`}
                      className="w-24"
                      placeholder="0:42"
                      aria-label={`Moment in clip ${i + 1} (minutes:seconds)`}
                      defaultValue={chosen.momentMs == null ? "" : `${Math.floor(chosen.momentMs / 60000)}:${String(Math.floor(chosen.momentMs / 1000) % 60).padStart(2, "0")}`}
                      onBlur={(e) => onChange(value.map((v) => (v === chosen ? { ...v, momentMs: readMoment(e.target.value) } : v)))}
                    />
                  </label>
                ) : null}
              </li>
            );
          })}
        </ul>
      ) : null}
    </fieldset>
  );
}
