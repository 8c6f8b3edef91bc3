"use client";
import { CircleCheck, CircleX } from "lucide-react";
import type { ReactNode } from "react";

// The composers' shared pieces: one picked file's row (its outcome mark, its name, what can be
// done with it, and below that its progress and words), and the share choice, which means the
// same for every kind of entry: ticked any time before "post", the entry goes to the owner.

export function PickedFileRow({ name, outcome, actions, children }: { name: string; outcome: "good" | "failed" | null; actions?: ReactNode; children: ReactNode }) {
  return (
    <li className="rounded-lg border border-line p-3">
      <div className="flex items-center gap-2">
        {outcome === "good" ? <CircleCheck aria-hidden className="size-5 shrink-0 text-moss" /> : null}
        {outcome === "failed" ? <CircleX aria-hidden className="size-5 shrink-0 text-rust" /> : null}
        <span className="min-w-0 flex-1 truncate font-semibold">{name}</span>
        {actions}
      </div>
      {children}
    </li>
  );
}

export function ShareWithOwner({ share, onChange }: { share: boolean; onChange: (share: boolean) => void }) {
  return (
    <label className="flex min-h-tap items-center gap-3">
      <input type="checkbox" checked={share} onChange={(e) => onChange(e.target.checked)} className="size-6 accent-oil" />
      <span>Share with the owner now (otherwise shop only)</span>
    </label>
  );
}
