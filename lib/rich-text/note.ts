// Job notes: tiptap JSON checked against an explicit allow-list (zod), then against the
// ProseMirror schema built from the editor's own extensions. Pure: runs in the browser (to warn
// before posting) and on the server (the check that counts).
import { getSchema } from "@tiptap/core";
import type { Node as PMNode, Schema } from "@tiptap/pm/model";
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { noteExtensions } from "@/lib/rich-text/extensions";
import { HREF_MAX_LENGTH, LINK_RULE_MESSAGE, safeHref } from "@/lib/rich-text/href";
import { NOTE_LIMITS, NOTE_MARK_TYPES, type NoteDoc, type NoteMark, type NoteNode, ORDERED_LIST_STYLES } from "@/lib/rich-text/note-types";

// The note's types live in note-types.ts; importers of this module keep finding them here.
export { NOTE_MARK_TYPES, NOTE_NODE_TYPES, ORDERED_LIST_STYLES } from "@/lib/rich-text/note-types";
export type { NoteDoc, NoteMark, NoteNode };

// The limits live in note-types.ts too, so the editor shows the characters left without zod.
export { NOTE_LIMITS } from "@/lib/rich-text/note-types";

const MESSAGES = {
  empty: "Write something before posting.",
  tooLong: `This note is too long: keep it under ${NOTE_LIMITS.maxChars.toLocaleString("en-US")} characters.`,
  tooBig: "This note has too much formatting to save: split it into two notes.",
  tooDeep: `This note has lists or quotes nested too deeply: keep it within ${NOTE_LIMITS.maxDepth} levels.`,
  unreadable: "This note couldn't be read. Reload the page and try again.",
  layout: "This note isn't laid out in a way the editor allows.",
  notDoc: "A note must be a document (type 'doc')",
};

// Names from the input go into messages: only show ones that look like a type name.
const shown = (value: unknown) =>
  typeof value === "string" && /^[A-Za-z][\w-]{0,39}$/.test(value) ? `'${value}'` : "that kind of content";

/** An object that refuses unknown keys by name; `missing` is the message when it is absent or not an object. */
function strict<T extends z.ZodRawShape>(name: string, shape: T, missing?: string) {
  return z.strictObject(shape, {
    error: (iss) => {
      if (iss.code === "unrecognized_keys") return `Notes can't set ${iss.keys.map(shown).join(", ")} on '${name}'`;
      if (iss.code === "invalid_type") return missing;
      return undefined;
    },
  });
}

const hrefSchema = z
  .string({ error: LINK_RULE_MESSAGE })
  .max(HREF_MAX_LENGTH, `Links must be shorter than ${HREF_MAX_LENGTH} characters`)
  .transform((value, ctx) => {
    const href = safeHref(value);
    if (href === null) {
      ctx.addIssue({ code: "custom", message: LINK_RULE_MESSAGE });
      return z.NEVER;
    }
    return href;
  });

const HEADING_RULE = "Headings in a note can only be level 2 or 3";

const optionalText = z.string().max(200).nullable().optional();

const markSchema = z.discriminatedUnion(
  "type",
  [
    strict("bold", { type: z.literal("bold") }),
    strict("italic", { type: z.literal("italic") }),
    strict("link", {
      type: z.literal("link"),
      // The editor also sends target/rel/class/title; the view sets its own, so keep only href.
      attrs: strict("link", { href: hrefSchema, target: optionalText, rel: optionalText, class: optionalText, title: optionalText }, LINK_RULE_MESSAGE)
        .transform(({ href }) => ({ href })),
    }),
  ],
  {
    error: (iss) =>
      iss.code === "invalid_union"
        ? `Notes can't use the ${shown((iss.input as { type?: unknown } | null)?.type)} style`
        : "Each style in a note needs a type",
  },
);

const marksSchema = z
  .array(markSchema)
  .max(NOTE_MARK_TYPES.length)
  .refine((marks) => new Set(marks.map((m) => m.type)).size === marks.length, "A piece of text can't have the same style twice")
  .optional();

const contentSchema = (): z.ZodType<NoteNode[] | undefined> =>
  z.array(nodeSchema, { error: "A note's content must be a list of parts" }).optional();

const nodeSchema: z.ZodType<NoteNode> = z.lazy(() => {
  const content = contentSchema();
  return z.discriminatedUnion(
    "type",
    [
      strict("paragraph", { type: z.literal("paragraph"), content }),
      strict("heading", {
        type: z.literal("heading"),
        attrs: strict("heading", { level: z.union([z.literal(2), z.literal(3)], { error: HEADING_RULE }) }, HEADING_RULE),
        content,
      }),
      strict("bulletList", { type: z.literal("bulletList"), content }),
      strict("orderedList", {
        type: z.literal("orderedList"),
        attrs: strict("orderedList", {
          start: z.number().int().min(0).max(99_999).optional(),
          type: z.enum(ORDERED_LIST_STYLES).nullable().optional(),
        }).optional(),
        content,
      }),
      strict("listItem", { type: z.literal("listItem"), content }),
      strict("blockquote", { type: z.literal("blockquote"), content }),
      strict("hardBreak", { type: z.literal("hardBreak"), marks: marksSchema }),
      strict("text", {
        type: z.literal("text"),
        text: z.string({ error: "Text in a note must be a string" }).min(1, "Text in a note can't be empty"),
        marks: marksSchema,
      }),
    ],
    {
      error: (iss) =>
        iss.code === "invalid_union"
          ? `Notes can't contain ${shown((iss.input as { type?: unknown } | null)?.type)}`
          : "Each part of a note needs a type",
    },
  );
});

/** The allow-list alone (types, marks, attributes); parseNote adds sizes, emptiness and structure. */
export const noteDocSchema: z.ZodType<NoteDoc> = strict("doc", {
  type: z.literal("doc", { error: MESSAGES.notDoc }),
  content: contentSchema(),
});

// Plain text lives apart so e-mail and summary code can use it without the tiptap schema.
export { noteExcerpt, noteText } from "@/lib/rich-text/note-text";

let pmSchema: Schema | undefined;
/** ProseMirror schema of the editor's extensions; built once, on first use. */
export function getNoteSchema(): Schema {
  return (pmSchema ??= getSchema(noteExtensions));
}

export type ParseNoteOptions = {
  /** Key of the per-field message in the AppError (the form field holding the note). */
  field?: string;
};

/**
 * Checks a note from the editor (the JSON object, or the JSON string of a hidden input) and returns
 * it normalised. Throws AppError("invalid") (HTTP 422) with one clear message otherwise.
 */
export function parseNote(input: unknown, { field = "note" }: ParseNoteOptions = {}): NoteDoc {
  function fail(message: string, more: string[] = []): never {
    throw new AppError("invalid", message, { [field]: [...new Set([message, ...more])] });
  }

  let json: unknown = input;
  let serialised: string | undefined;
  try {
    serialised = typeof input === "string" ? input : JSON.stringify(input);
  } catch {
    fail(MESSAGES.unreadable);
  }
  if (serialised === undefined || input === null || input === "") fail(MESSAGES.empty);
  if (new TextEncoder().encode(serialised).length > NOTE_LIMITS.maxBytes) {
    // Say "too long" when the words are the problem, "too much formatting" otherwise.
    fail(rawCharCount(typeof input === "string" ? safeJsonParse(input) : input) > NOTE_LIMITS.maxChars ? MESSAGES.tooLong : MESSAGES.tooBig);
  }
  if (typeof input === "string") {
    json = safeJsonParse(input);
    if (json === undefined) fail(MESSAGES.unreadable);
  }
  if (json === null || json === undefined) fail(MESSAGES.empty);
  if (!isRecord(json) || Array.isArray(json)) fail(MESSAGES.notDoc);
  if (rawDepth(json) > NOTE_LIMITS.maxDepth) fail(MESSAGES.tooDeep);

  const parsed = noteDocSchema.safeParse(json);
  if (!parsed.success) {
    const messages = parsed.error.issues.map((i) => i.message);
    fail(messages[0] ?? MESSAGES.unreadable, messages.slice(1, 5));
  }
  const doc = parsed.data;
  if (rawCharCount(doc) > NOTE_LIMITS.maxChars) fail(MESSAGES.tooLong);
  // Any visible character anywhere: structure problems get their own message below.
  if (!hasVisibleText(doc)) fail(MESSAGES.empty);

  let node: PMNode;
  try {
    node = getNoteSchema().nodeFromJSON(doc);
  } catch {
    return fail(MESSAGES.layout);
  }
  try {
    node.check();
  } catch {
    fail(layoutProblem(node) ?? MESSAGES.layout);
  }
  return doc;
}

/** Same checks as parseNote, as a zod field for route/action input schemas (422 with the message). */
export const noteInputSchema = z.unknown().transform((value, ctx): NoteDoc => {
  try {
    return parseNote(value);
  } catch (error) {
    if (!(error instanceof AppError)) throw error;
    ctx.addIssue({ code: "custom", message: error.message });
    return z.NEVER;
  }
});

// The first place the content breaks the schema, in words: ProseMirror's own text is for developers.
function layoutProblem(node: PMNode): string | null {
  let match = node.type.contentMatch;
  for (let i = 0; i < node.childCount; i++) {
    const child = node.child(i);
    const next = match.matchType(child.type);
    if (!next) return `Notes can't put '${child.type.name}' directly inside '${node.type.name}'`;
    match = next;
  }
  if (!match.validEnd) return `'${node.type.name}' in this note is missing what belongs inside it`;
  for (let i = 0; i < node.childCount; i++) {
    const problem = layoutProblem(node.child(i));
    if (problem) return problem;
  }
  return null;
}

function safeJsonParse(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null;

/** Deepest chain of `content` arrays, walked without recursion (input may be hostile). */
function rawDepth(root: unknown): number {
  let max = 0;
  const stack: [unknown, number][] = [[root, 1]];
  while (stack.length) {
    const [value, depth] = stack.pop()!;
    if (!isRecord(value)) continue;
    max = Math.max(max, depth);
    if (max > NOTE_LIMITS.maxDepth) return max;
    if (Array.isArray(value.content)) for (const child of value.content) stack.push([child, depth + 1]);
  }
  return max;
}

function hasVisibleText(root: unknown): boolean {
  const stack: unknown[] = [root];
  while (stack.length) {
    const value = stack.pop();
    if (!isRecord(value)) continue;
    if (typeof value.text === "string" && /\S/u.test(value.text)) return true;
    if (Array.isArray(value.content)) stack.push(...value.content);
  }
  return false;
}

/** Code points in all `text` fields, also for input that has not passed the schema yet. */
function rawCharCount(root: unknown): number {
  let count = 0;
  const stack: unknown[] = [root];
  while (stack.length) {
    const value = stack.pop();
    if (!isRecord(value)) continue;
    if (typeof value.text === "string") for (const _ of value.text) count++;
    if (Array.isArray(value.content)) stack.push(...value.content);
  }
  return count;
}
