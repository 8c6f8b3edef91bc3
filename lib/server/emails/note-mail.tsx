// A job note in an e-mail: the same allow-list as the read-only view (components/rich-text/
// note-view.tsx), with inline styles from theme.ts because mail clients drop style sheets.
// Text reaches React only as child strings (escaped), every href is checked again with safeHref
// (http, https, mailto), and anything not on the list renders nothing (OWASP XSS Prevention
// Cheat Sheet: output encoding + URL allow-list). The `data-note` attributes let render.ts give
// the text part the same structure (headings on their own line, "- " and "1. " markers).
import { Fragment, type CSSProperties, type ReactNode } from "react";
import { safeHref } from "@/lib/rich-text/href";
import type { NoteDoc, NoteMark, NoteNode } from "@/lib/rich-text/note-types";
import { mailColors as c } from "./theme";

const MAX_DEPTH = 16;

const s = {
  paragraph: { color: c.ink, fontSize: 16, lineHeight: "24px", margin: "0 0 12px" },
  // In a list item, paragraphs sit close: the item's own spacing separates them.
  itemParagraph: { color: c.ink, fontSize: 16, lineHeight: "24px", margin: 0 },
  h2: { color: c.ink, fontSize: 19, fontWeight: 700, lineHeight: "26px", margin: "16px 0 8px" },
  h3: { color: c.ink, fontSize: 17, fontWeight: 700, lineHeight: "24px", margin: "12px 0 6px" },
  list: { color: c.ink, fontSize: 16, lineHeight: "24px", margin: "0 0 12px", paddingLeft: 24 },
  nestedList: { color: c.ink, fontSize: 16, lineHeight: "24px", margin: "4px 0 0", paddingLeft: 24 },
  item: { margin: "0 0 4px" },
  quote: { borderLeft: `4px solid ${c.line}`, color: c.inkMuted, margin: "0 0 12px", padding: "0 0 0 12px" },
  link: { color: c.oil, textDecoration: "underline" },
} satisfies Record<string, CSSProperties>;

type Where = { inItem: boolean; inList: boolean };

/** The note's blocks, in mail markup. `doc` may come straight from a stored row: unknown shapes render nothing. */
export function NoteMail({ doc }: { doc: NoteDoc }) {
  const blocks = isNode(doc) && doc.type === "doc" ? children(doc.content, { inItem: false, inList: false }, 1) : null;
  return <div data-note="doc">{blocks}</div>;
}

function isNode(value: unknown): value is { type: unknown } {
  return typeof value === "object" && value !== null && "type" in value;
}

function children(content: unknown, where: Where, depth: number): ReactNode[] | null {
  if (!Array.isArray(content) || depth > MAX_DEPTH) return null;
  return content.map((child, i) => node(child as NoteNode, i, where, depth));
}

function node(n: NoteNode, key: number, where: Where, depth: number): ReactNode {
  if (!isNode(n)) return null;
  const inner = (w: Where) => ("content" in n ? children(n.content, w, depth + 1) : null);
  switch (n.type) {
    case "paragraph":
      return (
        <p key={key} data-note={where.inItem ? "item-paragraph" : "paragraph"} style={where.inItem ? s.itemParagraph : s.paragraph}>
          {inner(where)}
        </p>
      );
    case "heading": {
      // The mail's own heading is the h1; a note's larger heading is h2, its smaller one h3.
      const large = n.attrs?.level === 2;
      const Tag = large ? "h2" : "h3";
      return (
        <Tag key={key} data-note="heading" style={large ? s.h2 : s.h3}>
          {inner(where)}
        </Tag>
      );
    }
    case "bulletList":
      return (
        <ul key={key} data-note="list" style={{ ...(where.inList ? s.nestedList : s.list), listStyleType: "disc" }}>
          {inner({ inItem: false, inList: true })}
        </ul>
      );
    case "orderedList": {
      const start = n.attrs?.start;
      const type = n.attrs?.type;
      return (
        <ol
          key={key}
          data-note="list"
          start={Number.isSafeInteger(start) && start !== 1 ? start : undefined}
          type={type === "a" || type === "A" || type === "i" || type === "I" ? type : undefined}
          style={where.inList ? s.nestedList : s.list}
        >
          {inner({ inItem: false, inList: true })}
        </ol>
      );
    }
    case "listItem":
      return (
        <li key={key} style={s.item}>
          {inner({ inItem: true, inList: true })}
        </li>
      );
    case "blockquote":
      return (
        <blockquote key={key} data-note="quote" style={s.quote}>
          {inner({ inItem: false, inList: where.inList })}
        </blockquote>
      );
    case "hardBreak":
      return <br key={key} />;
    case "text":
      return typeof n.text === "string" ? marked(n.text, n.marks, key) : null;
    default:
      return null; // not on the allow-list
  }
}

function marked(text: string, marks: NoteMark[] | undefined, key: number): ReactNode {
  let out: ReactNode = text;
  // Innermost first, so a link wraps the bold or italic text inside it.
  for (const mark of Array.isArray(marks) ? [...marks].reverse() : []) {
    if (!isNode(mark)) continue;
    if (mark.type === "bold") out = <strong>{out}</strong>;
    else if (mark.type === "italic") out = <em>{out}</em>;
    else if (mark.type === "link") {
      const href = safeHref(mark.attrs?.href);
      // A link we can't vouch for stays plain text.
      if (href) out = <a href={href} style={s.link}>{out}</a>;
    }
  }
  return <Fragment key={key}>{out}</Fragment>;
}
