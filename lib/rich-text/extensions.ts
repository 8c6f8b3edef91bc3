// The one list of tiptap extensions for job notes. The editor uses it to edit, and the server
// builds its ProseMirror schema from it (lib/rich-text/note.ts), so what the toolbar can make and
// what the server accepts never drift apart. Keep NOTE_NODE_TYPES / NOTE_MARK_TYPES in note.ts in
// step with what is switched on here (tests/unit/note.test.ts checks both lists against the schema).
import type { Extensions } from "@tiptap/core";
import { StarterKit } from "@tiptap/starter-kit";
import { safeHref } from "@/lib/rich-text/href";

export const NOTE_HEADING_LEVELS = [2, 3] as const;

// What linkify hands autolink before it adds the default protocol: "parts.example.test/x", "a@b.test".
const BARE_HOST = /^(?:[a-z0-9-]+\.)+[a-z]{2,}(?::\d{1,5})?(?:[/?#]\S*)?$/i;
const BARE_EMAIL = /^[^\s/@:]+@(?:[a-z0-9-]+\.)+[a-z]{2,}$/i;

/**
 * The Link extension asks this for every href it would create (typed, pasted, autolinked).
 * Absolute URLs must pass safeHref; a bare host or address is let through only because linkify
 * adds https:// or mailto: to it before the mark is made. javascript:, data: and friends never pass.
 */
export function editorAllowsHref(url: string): boolean {
  if (safeHref(url) !== null) return true;
  return BARE_HOST.test(url) || BARE_EMAIL.test(url);
}

export const noteExtensions: Extensions = [
  StarterKit.configure({
    heading: { levels: [...NOTE_HEADING_LEVELS] },
    // Off: not on the server's allow-list, and not needed to describe work on a machine.
    code: false,
    codeBlock: false,
    strike: false,
    underline: false,
    horizontalRule: false,
    link: {
      openOnClick: false, // a tap in the editor places the caret; links open from the read-only view
      autolink: true,
      linkOnPaste: true,
      defaultProtocol: "https",
      // `protocols` only *adds* schemes to linkify; the restriction is isAllowedUri.
      isAllowedUri: (url) => editorAllowsHref(url),
      HTMLAttributes: { rel: "noopener noreferrer nofollow ugc", target: "_blank", class: null },
    },
  }),
];
