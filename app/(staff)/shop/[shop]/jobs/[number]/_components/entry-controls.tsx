"use client";
import { Eye, FilePenLine, History, Lock, Pencil, Trash2 } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import useSWR from "swr";
import { Alert, Button } from "@/components/ui";
import type { TimelineEntry } from "@/lib/journal";
import { RECORD_ENTRY_KINDS, VISIBILITY_LABEL } from "@/lib/journal";
import { jsonFetcher, sendJson } from "@/lib/swr/fetcher";
import { MomentMarker, playerTime } from "./moment-marker";

type Props = {
  jobPublicId: string;
  /** The finding form's address, when this person may draft findings. */
  findingsPath: string | null;
  entry: TimelineEntry;
  mayModerate: boolean;
  onChanged: () => void;
  onEdit: () => void;
};

/** Share, edit, delete and history for one entry. Status changes are records: history only. */
export function EntryControls({ jobPublicId, findingsPath, entry, mayModerate, onChanged, onEdit }: Props) {
  const router = useRouter();
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState<null | "share" | "delete">(null);
  const [error, setError] = useState<string | null>(null);
  const [showHistory, setShowHistory] = useState(false);
  const url = `/api/jobs/${jobPublicId}/entries/${entry.id}`;
  const mayChange = (entry.mine || mayModerate) && !RECORD_ENTRY_KINDS.includes(entry.kind);

  async function run(kind: "share" | "delete", method: "PATCH" | "DELETE", body: unknown) {
    setBusy(kind);
    setError(null);
    try {
      await sendJson(url, method, body);
      onChanged();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(null);
      setConfirming(false);
    }
  }

  const shared = entry.visibility === "shared";
  return (
    <div className="w-full space-y-2">
      <div className="flex flex-wrap gap-2">
        {mayChange ? (
          <Button
            variant={shared ? "secondary" : "primary"}
            loading={busy === "share"}
            icon={shared ? <Lock aria-hidden className="size-5" /> : <Eye aria-hidden className="size-5" />}
            onClick={() => void run("share", "PATCH", { version: entry.version, visibility: shared ? "shop" : "shared" })}
          >
            {shared ? `Make ${VISIBILITY_LABEL.shop.toLowerCase()}` : "Share with owner"}
          </Button>
        ) : null}
        {mayChange ? (
          <Button variant="secondary" icon={<Pencil aria-hidden className="size-5" />} onClick={onEdit}>
            Edit
          </Button>
        ) : null}
        {mayChange && !confirming ? (
          <Button variant="ghost" icon={<Trash2 aria-hidden className="size-5" />} onClick={() => setConfirming(true)}>
            Delete
          </Button>
        ) : null}
        {findingsPath && entry.kind === "clip" && entry.clip?.status === "ready" ? (
          <Button
            variant="secondary"
            icon={<FilePenLine aria-hidden className="size-5" />}
            onClick={() => {
              // The moment the player is at now (paused on what was found), in whole seconds.
              const at = Math.floor(playerTime(entry.id));
              router.push(`${findingsPath}?clip=${encodeURIComponent(entry.clip!.id)}&at=${at}`);
            }}
          >
            Finding from this moment
          </Button>
        ) : null}
        {entry.editedAt || (entry.version ?? 1) > 1 ? (
          <Button variant="ghost" aria-expanded={showHistory} icon={<History aria-hidden className="size-5" />} onClick={() => setShowHistory((v) => !v)}>
            History
          </Button>
        ) : null}
      </div>
      {entry.kind === "clip" && entry.clip?.status === "ready" ? <MomentMarker jobPublicId={jobPublicId} entryId={entry.id} clipId={entry.clip.id} onMarked={onChanged} /> : null}
      {confirming ? (
        <div role="group" aria-label="Confirm delete" className="flex flex-wrap items-center gap-2 rounded-lg bg-rust-soft p-3">
          <span className="flex-1 font-semibold text-ink">
            Delete this entry?{shared ? " The owner will no longer see it." : ""} It stays in the shop&apos;s history.
          </span>
          <Button variant="danger" loading={busy === "delete"} onClick={() => void run("delete", "DELETE", { version: entry.version })}>
            Delete
          </Button>
          <Button variant="secondary" onClick={() => setConfirming(false)}>
            Keep
          </Button>
        </div>
      ) : null}
      {error ? <Alert tone="error">{error}</Alert> : null}
      {showHistory ? <EntryHistory url={`${url}/history`} /> : null}
    </div>
  );
}

type Revision = { version: number; change: string; visibility: string; caption: string | null; at: string; by: string | null };
const CHANGE_LABEL: Record<string, string> = { edit: "Edited", share: "Shared", unshare: "Made shop-only", delete: "Deleted" };

function EntryHistory({ url }: { url: string }) {
  const { data, error, isLoading } = useSWR<{ revisions: Revision[] }>(url, jsonFetcher);
  if (error) return <Alert tone="error">{(error as Error).message}</Alert>;
  if (isLoading || !data) return <p className="text-sm text-ink-muted">Loading history…</p>;
  return (
    <ol className="space-y-1 text-sm" aria-label="Earlier versions">
      {data.revisions.map((r) => (
        <li key={`${r.version}-${r.at}`} className="border-l-2 border-line pl-2">
          <span className="font-semibold">{CHANGE_LABEL[r.change] ?? r.change}</span> by {r.by ?? "a former user"},{" "}
          <time dateTime={r.at}>{new Date(r.at).toLocaleString()}</time> (version {r.version} was {VISIBILITY_LABEL[r.visibility as "shop" | "shared"].toLowerCase()}
          {r.caption ? `, caption “${r.caption}”` : ""})
        </li>
      ))}
    </ol>
  );
}
