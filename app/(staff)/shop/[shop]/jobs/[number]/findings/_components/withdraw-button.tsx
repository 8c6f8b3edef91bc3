"use client";
import { Undo2 } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert, Button, Field, Input } from "@/components/ui";
import { postWithdraw } from "@/lib/client/approvals";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";

/** Take an unanswered request back (confirmed first); the owner sees it was withdrawn. */
export function WithdrawButton({ requestPublicId }: { requestPublicId: string }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [reasonError, setReasonError] = useState<string | undefined>(undefined);
  async function withdraw() {
    setBusy(true);
    const result = await postWithdraw(requestPublicId, reason.trim() || null);
    setBusy(false);
    setReasonError(result.ok ? undefined : result.fields?.reason?.[0]);
    if (!result.ok) return setError(formBanner(result, FORM_VISIBLE.withdraw) ?? result.message);
    setOpen(false);
    router.refresh();
  }
  if (!open) {
    return (
      <Button variant="secondary" icon={<Undo2 aria-hidden className="size-5" />} onClick={() => setOpen(true)}>
        Withdraw
      </Button>
    );
  }
  return (
    <div role="group" aria-label="Confirm withdrawing" className="w-full space-y-3 rounded-lg bg-rust-soft p-3">
      <Field id={`withdraw-${requestPublicId}`} label="Reason the owner will see (optional)" error={reasonError}>
        <Input value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} />
      </Field>
      {error ? <Alert tone="error">{error}</Alert> : null}
      <div className="flex flex-wrap gap-2">
        <Button variant="danger" loading={busy} onClick={() => void withdraw()}>
          Withdraw the request
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Keep it
        </Button>
      </div>
    </div>
  );
}
