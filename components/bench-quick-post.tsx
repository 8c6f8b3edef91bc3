"use client";
import clsx from "clsx";
import { Camera, Gauge, NotebookPen, Video, Wrench } from "lucide-react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { type ReactNode, useEffect, useRef, useState } from "react";
import { type QuickKind, QUICK_HASH, composerTarget, quickKindFromHash } from "@/lib/quick-post";

// Files taken with the camera on the bench page, carried to the job page's composer over a
// client-side navigation (module state survives it; a full reload drops them, and the composer is
// then simply opened for a second try).
let carried: { kind: "photos" | "clip"; files: File[] } | null = null;

type Props = {
  /** The staff job page, e.g. /shop/copper-gulch/jobs/12. */
  jobPath: string;
  /** Which page the bar is on: its own forms are opened in place, the other page's by going there. */
  on: "job" | "bench";
  /** Torque and readings are offered to those who may record at the bench. */
  mayRecord: boolean;
};

/**
 * The phone-first quick-post bar (issue 20 §3): note, photo, clip, torque, reading, one tap each.
 * It only opens and focuses the page's existing forms (the journal composer's tabs, by their ids;
 * the bench's torque and readings sections); photos and clips open the camera (`capture`) and hand
 * the file to the composer as if it had been picked there. First on the page; on a phone it sits
 * along the bottom edge, where a thumb reaches, and steps aside while a field has the keyboard.
 */
export function BenchQuickPost({ jobPath, on, mayRecord }: Props) {
  const router = useRouter();
  const photoInput = useRef<HTMLInputElement>(null);
  const clipInput = useRef<HTMLInputElement>(null);
  const benchPath = `${jobPath}/bench`;
  const typing = useTyping();

  // Arriving with a hash (#torque, #compose-note…) or with camera files from the other page. A
  // frame later: the router has then put the new address in place.
  useEffect(() => {
    const frame = requestAnimationFrame(() => {
      const load = carried;
      carried = null;
      if (on === "job" && load) {
        void handOver(load.kind, load.files);
        return;
      }
      const kind = quickKindFromHash(location.hash);
      if (kind && composerTarget(kind).page === on) void openForm(kind);
    });
    return () => cancelAnimationFrame(frame);
  }, [on]);

  function tap(kind: QuickKind) {
    if (kind === "photo" || kind === "clip") {
      // Switch the composer first, so it is ready when the camera comes back.
      if (on === "job") void openForm(kind, { focus: false });
      (kind === "photo" ? photoInput : clipInput).current?.click();
      return;
    }
    void openForm(kind);
  }

  function picked(kind: "photos" | "clip", input: HTMLInputElement) {
    const files = Array.from(input.files ?? []);
    input.value = "";
    if (!files.length) return;
    if (on === "job") void handOver(kind, files);
    else {
      carried = { kind, files };
      router.push(`${jobPath}${QUICK_HASH[kind === "photos" ? "photo" : "clip"]}`);
    }
  }

  const item = (kind: QuickKind, label: string, icon: ReactNode) => {
    const className =
      "inline-flex min-h-14 min-w-0 flex-col items-center justify-center gap-0.5 rounded-lg border border-line-strong bg-surface px-1 text-sm font-semibold text-ink hover:bg-sunken";
    // A form on the other page (torque from the job page, a note from the bench) is a plain link:
    // it works before scripts run too, and the bar there opens the form the address names.
    const page = composerTarget(kind).page;
    if (kind !== "photo" && kind !== "clip" && page !== on) {
      return (
        <Link key={kind} href={`${page === "bench" ? benchPath : jobPath}${QUICK_HASH[kind]}`} className={className}>
          {icon}
          {label}
        </Link>
      );
    }
    return (
      <button key={kind} type="button" onClick={() => tap(kind)} className={className}>
        {icon}
        {label}
      </button>
    );
  };

  const items = [
    item("note", "Note", <NotebookPen aria-hidden className="size-6" />),
    item("photo", "Photo", <Camera aria-hidden className="size-6" />),
    item("clip", "Clip", <Video aria-hidden className="size-6" />),
    ...(mayRecord ? [item("torque", "Torque", <Wrench aria-hidden className="size-6" />), item("reading", "Reading", <Gauge aria-hidden className="size-6" />)] : []),
  ];

  return (
    <nav
      aria-label="Quick post"
      className={clsx(
        "fixed inset-x-0 bottom-0 z-30 border-t border-line bg-paper px-3 pb-[max(0.5rem,env(safe-area-inset-bottom))] pt-2 shadow-[0_-2px_8px_rgb(0_0_0/0.08)]",
        "sm:static sm:z-auto sm:border-0 sm:bg-transparent sm:p-0 sm:shadow-none",
        typing && "max-sm:hidden",
      )}
    >
      <div className={clsx("grid gap-2 sm:max-w-2xl", items.length === 5 ? "grid-cols-5" : "grid-cols-3")}>{items}</div>
      <input ref={photoInput} type="file" accept="image/*" capture="environment" multiple hidden onChange={(e) => picked("photos", e.currentTarget)} />
      <input ref={clipInput} type="file" accept="video/*" capture="environment" hidden onChange={(e) => picked("clip", e.currentTarget)} />
    </nav>
  );
}

/**
 * Whether a text field has the focus (the phone's keyboard is up): the bar then makes room. It comes
 * back a moment after the field is left, not at once: leaving a field by pressing the form's own
 * button (Post, Save) must not put the bar under the finger before the press ends and take the click.
 */
function useTyping(): boolean {
  const [typing, setTyping] = useState(false);
  useEffect(() => {
    let later: ReturnType<typeof setTimeout> | undefined;
    const check = () => {
      const el = document.activeElement;
      const now = !!el && (el.matches(TEXT_ENTRY) || (el as HTMLElement).isContentEditable);
      clearTimeout(later);
      if (now) setTyping(true);
      else later = setTimeout(() => setTyping(false), BAR_RETURN_MS);
    };
    document.addEventListener("focusin", check);
    document.addEventListener("focusout", check);
    return () => {
      clearTimeout(later);
      document.removeEventListener("focusin", check);
      document.removeEventListener("focusout", check);
    };
  }, []);
  return typing;
}

/** Longer than a press (a tap is ~100–300 ms), short enough that the bar seems to return at once. */
const BAR_RETURN_MS = 600;

const TEXT_ENTRY = "input:not([type=checkbox]):not([type=radio]):not([type=file]):not([type=button]):not([type=submit]), textarea, select";

/** Waits a few frames for an element the page is about to render (a composer tab switching). */
async function waitFor<T extends Element>(find: () => T | null, tries = 60): Promise<T | null> {
  for (let i = 0; i < tries; i++) {
    const found = find();
    if (found) return found;
    await new Promise((r) => requestAnimationFrame(r));
  }
  return null;
}

const TYPED = "input:not([type]):not([disabled]), input[type=text]:not([disabled]), textarea:not([disabled])";
const FIELD = "input:not([type=hidden]):not([type=file]):not([disabled]), select:not([disabled]), textarea:not([disabled]), [contenteditable=true]";

/** Opens a form of this page: a composer tab (clicking its own tab button) or a bench section, and puts the caret in it. */
async function openForm(kind: QuickKind, { focus = true } = {}): Promise<void> {
  const target = composerTarget(kind);
  if (target.page === "job") {
    document.getElementById(target.tabId)?.click();
    const panel = await waitFor(() => document.getElementById(target.panelId));
    document.getElementById("composer-heading")?.scrollIntoView({ block: "start" });
    if (!focus || !panel) return;
    const field = kind === "note" ? await waitFor(() => panel.querySelector<HTMLElement>(FIELD)) : null;
    (field ?? document.getElementById(target.tabId))?.focus({ preventScroll: true });
    return;
  }
  const heading = document.getElementById(target.headingId);
  const section = heading?.closest("section") ?? null;
  heading?.scrollIntoView({ block: "start" });
  // The first thing to type (what was torqued or measured), else the form's first field.
  const form = section?.querySelector("form");
  (form?.querySelector<HTMLElement>(TYPED) ?? form?.querySelector<HTMLElement>(FIELD))?.focus({ preventScroll: true });
}

/** Gives camera files to the composer's own file input, as if they had been picked there. */
async function handOver(kind: "photos" | "clip", files: File[]): Promise<void> {
  const target = composerTarget(kind === "photos" ? "photo" : "clip");
  if (target.page !== "job") return;
  await openForm(kind === "photos" ? "photo" : "clip", { focus: false });
  const input = await waitFor(() => document.getElementById(target.panelId)?.querySelector<HTMLInputElement>("input[type=file]") ?? null);
  if (!input) return;
  const transfer = new DataTransfer();
  for (const file of files) transfer.items.add(file);
  input.files = transfer.files;
  input.dispatchEvent(new Event("change", { bubbles: true }));
  document.getElementById(target.tabId)?.focus({ preventScroll: true });
}
