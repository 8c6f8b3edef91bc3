// How much of a note an e-mail carries. A note may hold 20,000 characters, and a daily digest
// several notes; mail clients clip long messages (Gmail at about 100 KB of HTML) and a digest
// is read on a phone. So a note in mail keeps its first lines, whole and in their structure,
// up to MAIL_NOTE_LIMITS, and the mail says "read the rest on the job page". Pure, no I/O.
import type { NoteDoc, NoteNode } from "@/lib/rich-text/note-types";

export const MAIL_NOTE_LIMITS = {
  /** Characters (code points) of text shown; the block where they run out is cut at a word, with "…". */
  chars: 1_500,
  /** Lines of text shown: paragraphs, headings and each list item's paragraphs. */
  blocks: 24,
} as const;

const MAX_DEPTH = 16; // parseNote allows 12; stops runaway recursion on a row that skipped it

type Budget = { chars: number; blocks: number; cut: boolean };

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);
const isTextblock = (n: NoteNode) => n.type === "paragraph" || n.type === "heading";

/** The start of the note that fits the limits, and whether anything was left out. Unknown shapes give an empty note. */
export function capNote(body: unknown, limits: { chars: number; blocks: number } = MAIL_NOTE_LIMITS): { doc: NoteDoc; cut: boolean } {
  if (!isRecord(body) || body.type !== "doc") return { doc: { type: "doc", content: [] }, cut: false };
  const budget: Budget = { chars: limits.chars, blocks: limits.blocks, cut: false };
  return { doc: { type: "doc", content: capBlocks(body.content, budget, 1) }, cut: budget.cut };
}

function capBlocks(content: unknown, budget: Budget, depth: number): NoteNode[] {
  const out: NoteNode[] = [];
  if (!Array.isArray(content) || depth > MAX_DEPTH) return out;
  for (const child of content) {
    if (!isRecord(child) || typeof child.type !== "string") continue;
    if (budget.cut) break;
    const node = child as NoteNode;
    if (isTextblock(node)) {
      if (budget.blocks <= 0 || budget.chars <= 0) {
        budget.cut = true;
        break;
      }
      budget.blocks--;
      out.push({ ...node, content: capInline((node as { content?: unknown }).content, budget) } as NoteNode);
    } else if (node.type === "bulletList" || node.type === "orderedList" || node.type === "listItem" || node.type === "blockquote") {
      const kept = capBlocks(node.content, budget, depth + 1);
      if (kept.length) out.push({ ...node, content: kept });
    } else {
      // Inline content where a block belongs (only in rows that skipped parseNote): let the renderer decide.
      out.push(node);
    }
  }
  return out;
}

function capInline(content: unknown, budget: Budget): NoteNode[] {
  const out: NoteNode[] = [];
  if (!Array.isArray(content)) return out;
  for (const child of content) {
    if (!isRecord(child)) continue;
    const node = child as NoteNode;
    if (node.type !== "text" || typeof node.text !== "string") {
      out.push(node);
      continue;
    }
    const chars = Array.from(node.text);
    if (chars.length <= budget.chars) {
      budget.chars -= chars.length;
      out.push(node);
      continue;
    }
    const cut = chars.slice(0, Math.max(0, budget.chars)).join("");
    const atWord = cut.replace(/\s+\S*$/, "");
    const shown = (atWord.length >= cut.length * 0.6 ? atWord : cut).trimEnd();
    if (shown) out.push({ ...node, text: shown });
    out.push({ type: "text", text: "…" });
    budget.chars = 0;
    budget.cut = true;
    break;
  }
  return out;
}
