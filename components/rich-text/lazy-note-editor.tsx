"use client";
import clsx from "clsx";
import { type ComponentType, useCallback, useEffect, useRef, useState } from "react";
import { plainTextDoc } from "@/lib/rich-text/note-text";
import type { NoteEditorHandle, NoteEditorProps } from "./note-editor";

// The rich-text editor (tiptap) is the heaviest code on the staff job page, so it isn't fetched
// when the page mounts: a plain box that looks like it (same label, same frame) stands in, and
// the first focus or touch fetches the editor. What is typed meanwhile is kept: when the editor
// is ready it takes the text (a paragraph a line), the caret goes to its end, and the box goes,
// all in one step, so no keystroke falls between them. A note being edited (defaultValue) has
// rich content a plain box can't show, so its editor is fetched at once, as before.

type EditorModule = typeof import("./note-editor");
let loaded: EditorModule | null = null;
let loading: Promise<EditorModule> | null = null;
/** One fetch per page; once in, later composers (after a post, another entry's edit) mount the editor directly. */
function loadEditor(): Promise<EditorModule> {
  loading ??= import("./note-editor").then((m) => (loaded = m));
  return loading;
}

export function LazyNoteEditor(props: NoteEditorProps) {
  const { labelledBy, describedBy, invalid = false, disabled = false, placeholder = "What did you find or do?", name, defaultValue, onChange, className, onReady } = props;
  const [Editor, setEditor] = useState<ComponentType<NoteEditorProps> | null>(() => loaded?.NoteEditor ?? null);
  const [handedOver, setHandedOver] = useState(() => loaded !== null);
  const [draftDoc, setDraftDoc] = useState<string | null>(null);
  const box = useRef<HTMLDivElement | null>(null);
  const draft = useRef<HTMLTextAreaElement | null>(null);

  const load = useCallback(() => {
    if (!loaded || !Editor) void loadEditor().then((m) => setEditor(() => m.NoteEditor));
  }, [Editor]);

  // Content to show: fetch the editor straight away (the stand-in can't show rich text).
  useEffect(() => {
    if (defaultValue !== undefined) load();
  }, [defaultValue, load]);

  const takeOver = useCallback(
    (handle: NoteEditorHandle) => {
      onReady?.(handle);
      const area = draft.current;
      const text = area?.value ?? "";
      const hadFocus = !!area && document.activeElement === area;
      // Show the editor and hide the stand-in now, before React renders again.
      box.current?.setAttribute("data-ready", "");
      if (text) handle.setContent(plainTextDoc(text));
      if (hadFocus) handle.focus("end");
      setHandedOver(true);
    },
    [onReady],
  );

  return (
    <div ref={box} data-ready={handedOver ? "" : undefined} className="group">
      {handedOver ? null : defaultValue !== undefined ? (
        <div aria-hidden className={clsx("h-56 animate-pulse rounded-lg border border-line-strong bg-sunken group-data-[ready]:hidden", className)} />
      ) : (
        <div className={clsx("rounded-lg border bg-surface group-data-[ready]:hidden", invalid ? "border-2 border-rust" : "border-line-strong", disabled && "bg-sunken", className)}>
          {/* Where the formatting buttons come; they arrive with the editor. */}
          <div aria-hidden className="h-[3.25rem] border-b border-line" />
          <textarea
            ref={draft}
            aria-labelledby={labelledBy}
            aria-describedby={describedBy}
            aria-invalid={invalid || undefined}
            disabled={disabled}
            placeholder={placeholder}
            onFocus={load}
            onPointerDown={load}
            onChange={(e) => {
              const doc = plainTextDoc(e.target.value);
              setDraftDoc(JSON.stringify(doc));
              onChange?.(doc);
            }}
            className="block min-h-40 w-full resize-none rounded-b-lg bg-transparent px-3 py-2 text-base leading-relaxed text-ink placeholder:text-ink-muted"
          />
          {name && draftDoc ? <input type="hidden" name={name} value={draftDoc} /> : null}
        </div>
      )}
      {Editor ? (
        <div className={handedOver ? undefined : "hidden group-data-[ready]:block"}>
          {/* Named (form posts) only once it is the one shown: the stand-in's own input carries the draft until then. */}
          <Editor {...props} name={handedOver ? name : undefined} onReady={takeOver} />
        </div>
      ) : null}
    </div>
  );
}
