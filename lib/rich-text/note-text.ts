// Plain text of a note, for e-mails, search and summaries. No tiptap or zod here: safe to
// import anywhere, including the owner's client bundle.
import type { NoteDoc, NoteNode } from "@/lib/rich-text/note-types";

function inlineText(nodes: NoteNode[] | undefined): string {
  let out = "";
  for (const n of nodes ?? []) {
    if (n.type === "text") out += n.text;
    else if (n.type === "hardBreak") out += "\n";
  }
  return out;
}

function blocksText(nodes: NoteNode[] | undefined): string[] {
  const out: string[] = [];
  for (const n of nodes ?? []) {
    const indent = (text: string, first: string) =>
      text.split("\n").map((line, i) => (i === 0 ? first : " ".repeat(first.length)) + line).join("\n");
    if (n.type === "paragraph" || n.type === "heading") out.push(inlineText(n.content));
    else if (n.type === "blockquote") out.push(blocksText(n.content).map((b) => b.replace(/^/gm, "> ")).join("\n>\n"));
    else if (n.type === "bulletList" || n.type === "orderedList") {
      const start = n.type === "orderedList" ? (n.attrs?.start ?? 1) : 0;
      const items = (n.content ?? []).map((item, i) =>
        indent(blocksText(item.type === "listItem" ? item.content : [item]).join("\n"), n.type === "bulletList" ? "- " : `${start + i}. `),
      );
      out.push(items.join("\n"));
    } else if (n.type === "listItem") out.push(...blocksText(n.content));
    else out.push(inlineText([n])); // inline content where a block belongs: only in docs that skipped parseNote
  }
  return out.filter((b) => b.trim() !== "");
}

/** Plain text for e-mails, search and summaries: paragraphs apart, "- " and "1. " for lists, "> " for quotes. */
export function noteText(doc: NoteDoc): string {
  return blocksText(doc.content).join("\n\n").trim();
}

/** One line of at most `max` characters, cut at a word where possible, with "…" when shortened. */
export function noteExcerpt(doc: NoteDoc, max = 160): string {
  const flat = noteText(doc).replace(/^(?:- |\d+\. |> )/gm, "").replace(/\s+/g, " ").trim();
  const chars = Array.from(flat);
  if (chars.length <= max) return flat;
  const cut = chars.slice(0, Math.max(1, max - 1)).join("");
  const atWord = cut.replace(/\s+\S*$/, "");
  return `${atWord.length >= cut.length * 0.6 ? atWord : cut}…`;
}

/**
 * Plain text as a note: one paragraph a line (an empty line an empty paragraph), as the editor
 * makes it when Enter is pressed. For what was typed into the plain box that stands in for the
 * editor until its code has loaded (components/rich-text/lazy-note-editor.tsx).
 */
export function plainTextDoc(text: string): NoteDoc {
  const lines = text.replace(/\r\n?/g, "\n").split("\n");
  return { type: "doc", content: lines.map((line) => (line ? { type: "paragraph", content: [{ type: "text", text: line }] } : { type: "paragraph" })) };
}
