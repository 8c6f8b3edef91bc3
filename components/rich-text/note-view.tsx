// Read-only note: each allowed node type maps to one element; anything else renders nothing.
// Text only ever reaches React as a child string (escaped), never as HTML, and every href is
// checked again here, so a row that skipped parseNote still can't run script
// (OWASP XSS Prevention Cheat Sheet: output encoding + URL allow-list).
// No hooks and no tiptap import: works in server components and in the owner's client bundle.
import clsx from "clsx";
import { Fragment, type ReactNode } from "react";
import { safeHref } from "@/lib/rich-text/href";
import type { NoteDoc, NoteMark, NoteNode } from "@/lib/rich-text/note";

export const NOTE_LINK_REL = "noopener noreferrer nofollow ugc";

export type NoteViewProps = {
  doc: NoteDoc;
  /**
   * Level of the note's larger heading (its smaller one is one below). 2 matches the editor's
   * "H2"; pass 3 or 4 when the note sits under headings of its own page section.
   */
  headingLevel?: 2 | 3 | 4;
  className?: string;
};

type Ctx = { headingLevel: 2 | 3 | 4 };

const MAX_RENDER_DEPTH = 16; // parseNote allows 12; stops runaway recursion on unchecked data

export function NoteView({ doc, headingLevel = 2, className }: NoteViewProps) {
  const ctx: Ctx = { headingLevel };
  const blocks = isNode(doc) && doc.type === "doc" ? renderChildren(doc.content, ctx, 1) : null;
  return <div className={clsx("space-y-3 break-words text-base leading-relaxed text-ink", className)}>{blocks}</div>;
}

function isNode(value: unknown): value is { type: unknown } {
  return typeof value === "object" && value !== null && "type" in value;
}

function renderChildren(content: unknown, ctx: Ctx, depth: number): ReactNode[] | null {
  if (!Array.isArray(content) || depth > MAX_RENDER_DEPTH) return null;
  return content.map((child, i) => renderNode(child as NoteNode, i, ctx, depth));
}

function renderNode(node: NoteNode, key: number, ctx: Ctx, depth: number): ReactNode {
  if (!isNode(node)) return null;
  const children = "content" in node ? renderChildren(node.content, ctx, depth + 1) : null;
  switch (node.type) {
    case "paragraph":
      return <p key={key}>{children}</p>;
    case "heading": {
      // Level 3 in the note is the smaller heading; anything unexpected also falls to it.
      const large = node.attrs?.level === 2;
      const level = Math.min(ctx.headingLevel + (large ? 0 : 1), 6);
      const Tag = `h${level}` as "h2" | "h3" | "h4" | "h5";
      return (
        <Tag key={key} className={clsx("font-bold text-ink", large ? "pt-1 text-xl" : "text-lg")}>
          {children}
        </Tag>
      );
    }
    case "bulletList":
      return (
        <ul key={key} className="list-disc space-y-1 pl-6 marker:text-ink-muted">
          {children}
        </ul>
      );
    case "orderedList": {
      const start = node.attrs?.start;
      const style = node.attrs?.type;
      return (
        <ol
          key={key}
          start={Number.isSafeInteger(start) && start !== 1 ? start : undefined}
          type={style === "a" || style === "A" || style === "i" || style === "I" ? style : undefined}
          className="list-decimal space-y-1 pl-6 marker:text-ink-muted"
        >
          {children}
        </ol>
      );
    }
    case "listItem":
      // Tight lists: paragraphs inside an item sit closer than between blocks.
      return (
        <li key={key} className="pl-1 [&>*+*]:mt-1">
          {children}
        </li>
      );
    case "blockquote":
      return (
        <blockquote key={key} className="space-y-2 border-l-4 border-line-strong pl-4 text-ink-muted">
          {children}
        </blockquote>
      );
    case "hardBreak":
      return <br key={key} />;
    case "text":
      return typeof node.text === "string" ? withMarks(node.text, node.marks, key) : null;
    default:
      return null; // not on the allow-list: render nothing
  }
}

function withMarks(text: string, marks: NoteMark[] | undefined, key: number): ReactNode {
  let out: ReactNode = text;
  // Innermost first, so the link (first in ProseMirror's order) wraps the bold/italic inside it.
  for (const mark of Array.isArray(marks) ? [...marks].reverse() : []) {
    if (!isNode(mark)) continue;
    if (mark.type === "bold") out = <strong className="font-bold">{out}</strong>;
    else if (mark.type === "italic") out = <em>{out}</em>;
    else if (mark.type === "link") {
      const href = safeHref(mark.attrs?.href);
      // A link we can't vouch for shows as its plain text.
      if (href) {
        out = (
          <a href={href} target="_blank" rel={NOTE_LINK_REL} className="font-medium text-oil underline underline-offset-2 hover:no-underline">
            {out}
            <span className="sr-only"> (opens in a new tab)</span>
          </a>
        );
      }
    }
  }
  return <Fragment key={key}>{out}</Fragment>;
}
