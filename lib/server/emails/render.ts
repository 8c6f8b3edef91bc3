import "server-only";
import type { ReactElement } from "react";
import { render } from "@react-email/render";

// A job note's markup (note-mail.tsx, marked with data-note) in the text part: headings on a
// line of their own in their own case, paragraphs apart, list items as "- " and "1. " lines
// (nested ones indented under their item), quotes with "> ". Other mail markup is untouched.

type Elem = { name: string; attribs: Record<string, string | undefined>; children?: Elem[]; type?: string; data?: string };
type ListBuilder = {
  openList(o: { maxPrefixLength: number; prefixAlign: "left"; interRowLineBreaks: number; leadingLineBreaks: number }): void;
  openListItem(o: { prefix: string }): void;
  closeListItem(): void;
  closeList(o: { trailingLineBreaks: number }): void;
};

const ROMAN: [number, string][] = [[1000, "m"], [900, "cm"], [500, "d"], [400, "cd"], [100, "c"], [90, "xc"], [50, "l"], [40, "xl"], [10, "x"], [9, "ix"], [5, "v"], [4, "iv"], [1, "i"]];
function roman(n: number): string {
  let out = "";
  for (const [value, digits] of ROMAN) for (; n >= value; n -= value) out += digits;
  return out || String(n);
}
function letters(n: number): string {
  let out = "";
  for (let i = n; i > 0; i = Math.floor((i - 1) / 26)) out = String.fromCharCode(97 + ((i - 1) % 26)) + out;
  return out || String(n);
}
/** The marker an ordered list's item `n` shows, for the list's type attribute (HTML's <ol type>). */
export function listMarker(n: number, type: string | undefined): string {
  if (type === "a") return letters(n);
  if (type === "A") return letters(n).toUpperCase();
  if (type === "i") return roman(n);
  if (type === "I") return roman(n).toUpperCase();
  return String(n);
}

/** html-to-text formatter for a note's <ul>/<ol>: "- " or "1. " with no leading space, nested lists one line apart. */
function noteList(elem: Elem, walk: (nodes: Elem[], builder: ListBuilder) => void, builder: ListBuilder) {
  const nested = (elem as { parent?: { name?: string } }).parent?.name === "li";
  const items = (elem.children ?? []).filter((child) => child.name === "li");
  if (!items.length) return;
  let n = elem.name === "ol" ? Number(elem.attribs.start ?? 1) || 1 : 0;
  const prefixes = items.map(() => (elem.name === "ol" ? `${listMarker(n++, elem.attribs.type)}. ` : "- "));
  builder.openList({ maxPrefixLength: Math.max(...prefixes.map((p) => p.length)), prefixAlign: "left", interRowLineBreaks: 1, leadingLineBreaks: nested ? 1 : 2 });
  items.forEach((item, i) => {
    builder.openListItem({ prefix: prefixes[i]! });
    walk([item], builder);
    builder.closeListItem();
  });
  builder.closeList({ trailingLineBreaks: nested ? 1 : 2 });
}

const TEXT_OPTIONS = {
  formatters: { noteList },
  selectors: [
    { selector: "ul[data-note=list]", format: "noteList" },
    { selector: "ol[data-note=list]", format: "noteList" },
    { selector: "h2[data-note=heading]", format: "heading", options: { uppercase: false, leadingLineBreaks: 2, trailingLineBreaks: 2 } },
    { selector: "h3[data-note=heading]", format: "heading", options: { uppercase: false, leadingLineBreaks: 2, trailingLineBreaks: 2 } },
    // A list item's paragraphs follow each other line by line, not a blank line apart.
    { selector: "p[data-note=item-paragraph]", format: "block", options: { leadingLineBreaks: 1, trailingLineBreaks: 1 } },
  ],
};

/** An e-mail's HTML and its text part, both from the same template (the text part is derived from the HTML). */
export async function renderMail(element: ReactElement): Promise<{ html: string; text: string }> {
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true, htmlToTextOptions: TEXT_OPTIONS })]);
  return { html, text };
}
