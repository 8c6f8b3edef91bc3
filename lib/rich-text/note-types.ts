// The shape of a job note (tiptap JSON after parseNote), on its own so that note.ts (checking,
// with tiptap and zod) and note-text.ts (plain text, no dependencies) share it without importing
// each other.

export const NOTE_NODE_TYPES = ["doc", "paragraph", "heading", "text", "hardBreak", "bulletList", "orderedList", "listItem", "blockquote"] as const;
export const NOTE_MARK_TYPES = ["bold", "italic", "link"] as const;
export const ORDERED_LIST_STYLES = ["1", "a", "A", "i", "I"] as const;

export const NOTE_LIMITS = {
  /** UTF-8 bytes of the JSON as sent: bounds storage and parsing work. */
  maxBytes: 64 * 1024,
  /** Characters (code points) of text a person typed. */
  maxChars: 20_000,
  /** Nesting of blocks (lists in lists, quotes): deeper only arrives from crafted input. */
  maxDepth: 12,
} as const;

export type NoteMark = { type: "bold" } | { type: "italic" } | { type: "link"; attrs: { href: string } };
/** Which node may sit inside which is the ProseMirror schema's job (checked in parseNote). */
export type NoteNode =
  | { type: "paragraph"; content?: NoteNode[] }
  | { type: "heading"; attrs: { level: 2 | 3 }; content?: NoteNode[] }
  | { type: "bulletList"; content?: NoteNode[] }
  | { type: "orderedList"; attrs?: { start?: number; type?: (typeof ORDERED_LIST_STYLES)[number] | null }; content?: NoteNode[] }
  | { type: "listItem"; content?: NoteNode[] }
  | { type: "blockquote"; content?: NoteNode[] }
  | { type: "hardBreak"; marks?: NoteMark[] }
  | { type: "text"; text: string; marks?: NoteMark[] };
export type NoteDoc = { type: "doc"; content?: NoteNode[] };
