// Where each button of the quick-post bar (components/bench-quick-post.tsx) leads: the job page's
// journal composer (its tabs are addressed by the ids job-journal.tsx gives them) or a section of
// the bench page (addressed by its heading's id). Pure, so the unit tests read the same table.

export const QUICK_KINDS = ["note", "photo", "clip", "torque", "reading"] as const;
export type QuickKind = (typeof QUICK_KINDS)[number];

export type QuickTarget =
  | { page: "job"; tabId: string; panelId: string }
  | { page: "bench"; headingId: string };

const TARGETS: Record<QuickKind, QuickTarget> = {
  note: { page: "job", tabId: "tab-note", panelId: "panel-note" },
  photo: { page: "job", tabId: "tab-photos", panelId: "panel-photos" },
  clip: { page: "job", tabId: "tab-clip", panelId: "panel-clip" },
  torque: { page: "bench", headingId: "torque" },
  reading: { page: "bench", headingId: "readings" },
};

/** The address hash that opens a form when the other page sends someone to it. */
export const QUICK_HASH: Readonly<Record<QuickKind, string>> = {
  note: "#compose-note",
  photo: "#compose-photo",
  clip: "#compose-clip",
  // The bench sections' own anchors: the link scrolls there without scripts too.
  torque: "#torque",
  reading: "#readings",
};

export function composerTarget(kind: QuickKind): QuickTarget {
  return TARGETS[kind];
}

/** The form a hash asks for, if any ("#torque" → torque; anything else → null). */
export function quickKindFromHash(hash: string): QuickKind | null {
  const found = QUICK_KINDS.find((k) => QUICK_HASH[k] === hash);
  return found ?? null;
}
