import { PART_STATUS_LABEL, isPartBody, isReadingBody, isTeardownBody, isTorqueBody, sentenceCase, toleranceOf } from "@/lib/bench";
import { readingLine } from "@/lib/reading-text";
import { isMeasurementSetBody, measurementSetSummary } from "@/lib/measurements";
import { outcomeText } from "@/lib/torque-check";
import { anglePiece, fastenerPieces, toolLine, wrenchRangeFlags } from "@/lib/torque-special";
import { JOB_STATUS_LABEL } from "@/lib/job-status";
import { ENTRY_KIND_LABEL, type EntryKind, isStatusBody } from "@/lib/journal";
import type { NoteDoc } from "@/lib/rich-text/note";
import { noteExcerpt } from "@/lib/rich-text/note-text";
import { capNote } from "./note-cap";

export type EntrySummary = {
  label: string;
  /** A line or two; for a note, its one-line excerpt (photo alt text, previews). */
  text: string | null;
  /** A note's start in its structure (headings, lists, emphasis), within MAIL_NOTE_LIMITS; `cut` when some was left out. */
  note?: { doc: NoteDoc; cut: boolean };
};

/** What one shared entry says in an e-mail: a short label and a line or two of text, or a note's blocks. Pure. */
export function summarizeEntry(e: { kind: string; body: unknown; caption: string | null; photoCount: number; /** The shop's day the entry was made ("YYYY-MM-DD"): a torque's calibration age is judged on it. */ usedOn?: string }): EntrySummary {
  const label = ENTRY_KIND_LABEL[e.kind as EntryKind] ?? "Update";
  const b = e.body;
  switch (e.kind) {
    case "note": {
      const note = capNote(b);
      return { label, text: excerpt(b), ...(note.doc.content?.length ? { note } : {}) };
    }
    case "photos":
      return { label: `${e.photoCount} photo${e.photoCount === 1 ? "" : "s"}`, text: e.caption };
    case "status":
      if (!isStatusBody(b)) return { label, text: null };
      return { label: "Status", text: `${b.from ? `${JOB_STATUS_LABEL[b.from]} → ` : ""}${JOB_STATUS_LABEL[b.to]}${b.note ? `: ${b.note}` : ""}` };
    case "torque":
      // The real outcome, flagged when under or over; never "to spec" unless within tolerance. Then
      // angle stages, lubrication, loosen-and-retorque and one-time fasteners when recorded.
      // The wrench facts follow on their own lines, as the staff and owner views show them
      // (components/bench/torque-tool-facts.tsx, the same helpers).
      if (!isTorqueBody(b)) return { label, text: e.caption };
      return {
        label,
        text: [
          `${b.fastener}: ${[sentenceCase(outcomeText({ ...b, tolerancePct: toleranceOf(b) }, b.displayUnit)), anglePiece(b), ...fastenerPieces(b)].filter(Boolean).join("; ")}`,
          // Without the day (older callers) the calibration's age isn't judged: "" is before any date.
          toolLine(b, e.usedOn ?? ""),
          ...wrenchRangeFlags(b).map((f) => `Outside the wrench's range: ${f}.`),
        ]
          .filter(Boolean)
          .join("\n"),
      };
    case "reading":
      // Value, limit, source and verdict in one line: never the number alone (lib/reading-text.ts).
      return { label, text: isReadingBody(b) ? readingLine(b) : isMeasurementSetBody(b) ? measurementSetSummary(b) : e.caption };
    case "teardown":
      return { label, text: isTeardownBody(b) ? `Removed: ${b.removed}` : e.caption };
    case "part":
      return { label, text: isPartBody(b) ? `${b.description}: ${PART_STATUS_LABEL[b.to]}` : e.caption };
    default:
      return { label, text: e.caption };
  }
}

function excerpt(body: unknown): string | null {
  try {
    return noteExcerpt(body as NoteDoc, 400) || null;
  } catch {
    // A note that doesn't parse still gets its line in the digest, without text.
    return null;
  }
}
