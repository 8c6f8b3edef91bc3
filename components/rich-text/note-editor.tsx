"use client";

// The note composer's editor: tiptap with the same extensions the server checks against
// (lib/rich-text/extensions.ts). Its value is tiptap JSON, handed out through onChange and,
// when `name` is set, a hidden input holding the JSON string for form posts (parseNote accepts both).
//
// Clearing after a post: either remount it (`<NoteEditor key={postCount} … />`), or keep a ref
// (`const ref = useRef<NoteEditorHandle>(null)` … `ref.current?.clear()`).
import clsx from "clsx";
import { Bold, Heading2, Heading3, Italic, Link, List, ListOrdered, Redo2, TextQuote, Undo2, Unlink } from "lucide-react";
import { Selection } from "@tiptap/pm/state";
import { EditorContent, useEditor, useEditorState, type ChainedCommands, type Editor, type JSONContent } from "@tiptap/react";
import { useEffect, useId, useImperativeHandle, useMemo, useRef, useState, type ReactNode, type Ref } from "react";
import { Button, Field, Input } from "@/components/ui";
import { noteExtensions } from "@/lib/rich-text/extensions";
import { LINK_RULE_MESSAGE, hrefFromInput } from "@/lib/rich-text/href";
import { NOTE_LIMITS } from "@/lib/rich-text/note-types";

export type NoteEditorHandle = {
  /** Empties the editor (and the hidden input), e.g. after the note was posted. */
  clear: () => void;
  /** Puts the caret in the editor: where it was, or at the end. */
  focus: (at?: "end") => void;
  /** Replaces the content, as if typed (onChange is called). */
  setContent: (doc: JSONContent) => void;
};

export type NoteEditorProps = {
  /** id of the visible label (a <label> can't point at a contenteditable, so it is referenced). */
  labelledBy: string;
  /** When set, a hidden input of this name carries the JSON string. */
  name?: string;
  /** Starting content; read once, on mount (remount with a new `key` to load another note). */
  defaultValue?: JSONContent;
  onChange?: (doc: JSONContent) => void;
  /** Shown in the empty editor and given to assistive tech as aria-placeholder. */
  placeholder?: string;
  disabled?: boolean;
  /** ids of hint / error text for the editable area. */
  describedBy?: string;
  invalid?: boolean;
  className?: string;
  ref?: Ref<NoteEditorHandle>;
  /** Called once the editor exists and can take content and focus (LazyNoteEditor hands over to it). */
  onReady?: (handle: NoteEditorHandle) => void;
};

const EMPTY_DOC: JSONContent = { type: "doc", content: [{ type: "paragraph" }] };

// Preflight strips list and heading styles; these mirror NoteView so the editor looks like the result.
const EDITABLE_CLASS =
  "min-h-40 w-full rounded-b-lg px-3 py-2 text-base leading-relaxed text-ink [&>*+*]:mt-3 [&_h2]:text-xl [&_h2]:font-bold [&_h3]:text-lg [&_h3]:font-bold [&_ul]:list-disc [&_ul]:pl-6 [&_ol]:list-decimal [&_ol]:pl-6 [&_li>*+*]:mt-1 [&_blockquote]:border-l-4 [&_blockquote]:border-line-strong [&_blockquote]:pl-4 [&_blockquote]:text-ink-muted [&_a]:font-medium [&_a]:text-oil [&_a]:underline [&_strong]:font-bold";

export function NoteEditor({
  labelledBy,
  name,
  defaultValue,
  onChange,
  placeholder = "What did you find or do?",
  disabled = false,
  describedBy,
  invalid = false,
  className,
  ref,
  onReady,
}: NoteEditorProps) {
  const [serialised, setSerialised] = useState(() => JSON.stringify(defaultValue ?? EMPTY_DOC));
  const [linkOpen, setLinkOpen] = useState(false);

  const editorProps = useMemo(
    () => ({
      attributes: {
        role: "textbox",
        "aria-multiline": "true",
        "aria-labelledby": labelledBy,
        ...(describedBy ? { "aria-describedby": describedBy } : {}),
        ...(invalid ? { "aria-invalid": "true" } : {}),
        ...(disabled ? { "aria-disabled": "true" } : {}),
        "aria-placeholder": placeholder,
        class: EDITABLE_CLASS,
      },
    }),
    [labelledBy, describedBy, invalid, disabled, placeholder],
  );

  const editor = useEditor({
    extensions: noteExtensions,
    content: defaultValue ?? EMPTY_DOC,
    immediatelyRender: false, // rendered on the server first: let the client create the editor
    editable: !disabled,
    editorProps,
    onUpdate: ({ editor: current }) => {
      const doc = current.getJSON();
      setSerialised(JSON.stringify(doc));
      onChange?.(doc);
    },
  });

  useEffect(() => {
    editor?.setEditable(!disabled, false);
  }, [editor, disabled]);

  const handle = useMemo<NoteEditorHandle>(
    () => ({
      clear: () => {
        setLinkOpen(false);
        editor?.commands.clearContent(true);
      },
      focus: (at) => {
        if (!editor) return;
        if (at !== "end") return void editor.commands.focus();
        // At once, not on the next frame as tiptap's focus command does: a hand-over from the
        // stand-in box (LazyNoteEditor) must not leave a moment where keystrokes go nowhere.
        editor.view.dispatch(editor.state.tr.setSelection(Selection.atEnd(editor.state.doc)));
        editor.view.focus();
      },
      setContent: (doc) => {
        editor?.commands.setContent(doc);
      },
    }),
    [editor],
  );
  useImperativeHandle(ref, () => handle, [handle]);
  const readyFor = useRef<Editor | null>(null);
  useEffect(() => {
    if (!editor || readyFor.current === editor) return;
    readyFor.current = editor;
    onReady?.(handle);
  }, [editor, handle, onReady]);

  const state = useEditorState({
    editor,
    selector: ({ editor: e }) =>
      e
        ? {
            h2: e.isActive("heading", { level: 2 }),
            h3: e.isActive("heading", { level: 3 }),
            bold: e.isActive("bold"),
            italic: e.isActive("italic"),
            bullet: e.isActive("bulletList"),
            ordered: e.isActive("orderedList"),
            quote: e.isActive("blockquote"),
            link: e.isActive("link"),
            canUndo: e.can().undo(),
            canRedo: e.can().redo(),
            empty: e.isEmpty,
            chars: Array.from(e.state.doc.textContent).length, // code points, as the server counts
          }
        : null,
  });

  const off = disabled || !editor;
  const run = (command: (chain: ChainedCommands) => ChainedCommands) => {
    if (editor) command(editor.chain().focus()).run();
  };

  return (
    <div
      className={clsx(
        "rounded-lg border bg-surface",
        invalid ? "border-2 border-rust" : "border-line-strong",
        disabled && "bg-sunken",
        className,
      )}
    >
      <div role="group" aria-label="Formatting" className="flex flex-wrap gap-1 border-b border-line p-1">
        <ToolButton label="Large heading" pressed={state?.h2} disabled={off} onPress={() => run((c) => c.toggleHeading({ level: 2 }))}>
          <Heading2 aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Small heading" pressed={state?.h3} disabled={off} onPress={() => run((c) => c.toggleHeading({ level: 3 }))}>
          <Heading3 aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Bold" pressed={state?.bold} disabled={off} onPress={() => run((c) => c.toggleBold())}>
          <Bold aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Italic" pressed={state?.italic} disabled={off} onPress={() => run((c) => c.toggleItalic())}>
          <Italic aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Bulleted list" pressed={state?.bullet} disabled={off} onPress={() => run((c) => c.toggleBulletList())}>
          <List aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Numbered list" pressed={state?.ordered} disabled={off} onPress={() => run((c) => c.toggleOrderedList())}>
          <ListOrdered aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Quote" pressed={state?.quote} disabled={off} onPress={() => run((c) => c.toggleBlockquote())}>
          <TextQuote aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Link" pressed={state?.link || linkOpen} disabled={off} onPress={() => setLinkOpen((open) => !open)}>
          <Link aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Undo" disabled={off || !state?.canUndo} onPress={() => run((c) => c.undo())}>
          <Undo2 aria-hidden className="size-5" />
        </ToolButton>
        <ToolButton label="Redo" disabled={off || !state?.canRedo} onPress={() => run((c) => c.redo())}>
          <Redo2 aria-hidden className="size-5" />
        </ToolButton>
      </div>

      {linkOpen && editor ? (
        <LinkPanel editor={editor} hasLink={Boolean(state?.link)} onClose={() => setLinkOpen(false)} />
      ) : null}

      <div className="relative">
        {state?.empty && placeholder ? (
          <p aria-hidden className="pointer-events-none absolute inset-x-3 top-2 text-base text-ink-muted">
            {placeholder}
          </p>
        ) : null}
        {editor ? <EditorContent editor={editor} /> : <div aria-hidden className="min-h-40" />}
      </div>

      <CharactersLeft used={state?.chars ?? 0} />
      {name ? <input type="hidden" name={name} value={serialised} /> : null}
    </div>
  );
}

/** Quiet until the note nears the server's limit, so nobody loses a long note on posting. */
function CharactersLeft({ used }: { used: number }) {
  const left = NOTE_LIMITS.maxChars - used;
  const near = used >= NOTE_LIMITS.maxChars * 0.9;
  return (
    <p aria-live="polite" className={clsx("px-3 pb-2 text-sm", left < 0 ? "font-medium text-rust" : "text-ink-muted", !near && "sr-only")}>
      {near
        ? left >= 0
          ? `${left.toLocaleString("en-US")} characters left`
          : `${(-left).toLocaleString("en-US")} characters over the limit`
        : null}
    </p>
  );
}

function ToolButton({
  label,
  pressed,
  disabled,
  onPress,
  children,
}: {
  label: string;
  /** undefined for plain actions (undo/redo): only toggles announce a pressed state. */
  pressed?: boolean;
  disabled: boolean;
  onPress: () => void;
  children: ReactNode;
}) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      aria-pressed={pressed === undefined ? undefined : pressed}
      disabled={disabled}
      // Keep the caret and selection in the editor while the button is pressed.
      onMouseDown={(event) => event.preventDefault()}
      onClick={onPress}
      className="inline-flex size-tap select-none items-center justify-center rounded-lg text-ink transition-colors hover:bg-oil-soft active:bg-oil-soft/70 disabled:cursor-not-allowed disabled:opacity-60 aria-pressed:bg-oil aria-pressed:text-oil-on"
    >
      {children}
    </button>
  );
}

/** Inline box for a link address (not window.prompt: works with phone keyboards and screen readers). */
function LinkPanel({ editor, hasLink, onClose }: { editor: Editor; hasLink: boolean; onClose: () => void }) {
  const inputId = useId();
  const [value, setValue] = useState(() => String(editor.getAttributes("link").href ?? ""));
  const [error, setError] = useState<string | null>(null);

  const close = () => {
    onClose();
    editor.commands.focus();
  };

  const apply = () => {
    const href = hrefFromInput(value);
    if (!href) {
      setError(value.trim() ? LINK_RULE_MESSAGE : "Type the web or e-mail address first");
      return;
    }
    const chain = editor.chain().focus();
    if (editor.state.selection.empty && !editor.isActive("link")) {
      // Nothing selected: put the address itself in as the link text.
      chain.insertContent({ type: "text", text: href, marks: [{ type: "link", attrs: { href } }] }).run();
    } else {
      chain.extendMarkRange("link").setLink({ href }).run();
    }
    onClose();
  };

  return (
    <div className="flex flex-col gap-2 border-b border-line p-2 sm:flex-row sm:items-end">
      <Field id={inputId} label="Link address" error={error} className="grow">
        <Input
          inputMode="url"
          autoComplete="off"
          autoCapitalize="none"
          spellCheck={false}
          autoFocus
          placeholder="https://…"
          value={value}
          onChange={(event) => {
            setValue(event.target.value);
            setError(null);
          }}
          // The editor usually sits in a form: Enter here adds the link instead of posting the note.
          onKeyDown={(event) => {
            if (event.key === "Enter") {
              event.preventDefault();
              apply();
            } else if (event.key === "Escape") {
              event.preventDefault();
              close();
            }
          }}
        />
      </Field>
      <div className="flex flex-wrap gap-2">
        <Button variant="primary" onClick={apply}>
          {hasLink ? "Update link" : "Add link"}
        </Button>
        {hasLink ? (
          <Button
            variant="secondary"
            icon={<Unlink aria-hidden className="size-5" />}
            onClick={() => {
              editor.chain().focus().extendMarkRange("link").unsetLink().run();
              onClose();
            }}
          >
            Remove link
          </Button>
        ) : null}
        <Button variant="ghost" onClick={close}>
          Cancel
        </Button>
      </div>
    </div>
  );
}
