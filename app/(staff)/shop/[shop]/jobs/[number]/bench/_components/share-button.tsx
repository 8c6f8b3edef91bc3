"use client";
import { Eye } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert, Button } from "@/components/ui";
import { sendJson } from "@/lib/swr/fetcher";

/** One tap shares a record's timeline entry with the owner (the journal's own PATCH, with its version). */
export function ShareButton({ jobPublicId, entryId, version, label = "Share with owner" }: { jobPublicId: string; entryId: number; version: number; label?: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function share() {
    setBusy(true);
    setError(null);
    try {
      await sendJson(`/api/jobs/${jobPublicId}/entries/${entryId}`, "PATCH", { version, visibility: "shared" });
      router.refresh();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(false);
    }
  }
  return (
    <div className="space-y-2">
      <Button variant="secondary" loading={busy} icon={<Eye aria-hidden className="size-5" />} onClick={() => void share()}>
        {label}
      </Button>
      {error ? <Alert tone="error">{error}</Alert> : null}
    </div>
  );
}
