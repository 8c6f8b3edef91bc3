"use client";
import { Phone } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert, Button, Field, Input, Textarea } from "@/components/ui";
import { LineAnswers } from "@/components/approvals/line-answers";
import { type LineAnswer, type RequestSnapshot, decisionTotals } from "@/lib/approvals";
import { postRecordedDecision } from "@/lib/client/approvals";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";
import { formatMoney } from "@/lib/money";

const localNow = () => {
  const d = new Date();
  return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
};

/**
 * The desk notes an answer given by phone or in person, with what consent rules ask for: who
 * gave it, when, the number called, each line's answer and the new total (REFERENCES §6).
 */
export function PhoneDecisionForm({ snapshot, hash, ownerName, ownerPhone }: { snapshot: RequestSnapshot; hash: string; ownerName: string; ownerPhone: string | null }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [answers, setAnswers] = useState<Partial<Record<number, LineAnswer>>>({});
  const [method, setMethod] = useState<"phone" | "in_person">("phone");
  const [person, setPerson] = useState(ownerName);
  const [phone, setPhone] = useState(ownerPhone ?? "");
  const [at, setAt] = useState("");
  const [note, setNote] = useState("");
  const [partsBack, setPartsBack] = useState(false);
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [error, setError] = useState<string | null>(null);
  const money = (n: number) => formatMoney(n, snapshot.currency);
  const t = decisionTotals(snapshot, answers);

  if (!open) {
    return (
      <Button
        variant="secondary"
        icon={<Phone aria-hidden className="size-5" />}
        onClick={() => {
          setAt(localNow());
          setOpen(true);
        }}
      >
        Note an answer by phone or in person
      </Button>
    );
  }

  async function record() {
    setBusy(true);
    setError(null);
    const decidedAt = at ? new Date(at).toISOString() : "";
    const result = await postRecordedDecision(snapshot.request, {
      shownHash: hash,
      // Unanswered lines are left out: the server names each of them in its answer.
      lines: snapshot.lines.flatMap((l) => (answers[l.no] ? [{ no: l.no, answer: answers[l.no]! }] : [])),
      method,
      personName: person.trim(),
      phoneCalled: method === "phone" ? phone.trim() || null : null,
      decidedAt,
      note: note.trim() || null,
      wantsPartsBack: partsBack,
    });
    setBusy(false);
    setConfirming(false);
    if (!result.ok) {
      setErrors(result.fields ?? {});
      return setError(formBanner(result, FORM_VISIBLE.recordDecision) ?? result.message);
    }
    router.refresh();
  }

  return (
    <div className="w-full space-y-4 rounded-xl border border-line-strong p-4">
      <h4 className="text-lg font-bold text-ink">Note the owner&apos;s answer</h4>
      <fieldset className="space-y-2">
        <legend className="font-semibold text-ink">How did they answer?</legend>
        {(["phone", "in_person"] as const).map((m) => (
          <label key={m} className="flex min-h-tap cursor-pointer items-center gap-3 text-ink">
            <input type="radio" name={`method-${snapshot.request}`} className="size-5 accent-oil" checked={method === m} onChange={() => setMethod(m)} />
            {m === "phone" ? "By phone" : "In person"}
          </label>
        ))}
      </fieldset>
      <Field id={`person-${snapshot.request}`} label="Name of the person who answered" error={errors.personName?.[0]} required>
        <Input value={person} maxLength={120} onChange={(e) => setPerson(e.target.value)} />
      </Field>
      {method === "phone" ? (
        <Field id={`phone-${snapshot.request}`} label="Number you called" error={errors.phoneCalled?.[0]} required>
          <Input type="tel" value={phone} maxLength={40} onChange={(e) => setPhone(e.target.value)} />
        </Field>
      ) : null}
      <Field id={`at-${snapshot.request}`} label="When they answered" error={errors.decidedAt?.[0]} required>
        <Input type="datetime-local" value={at} onChange={(e) => setAt(e.target.value)} />
      </Field>
      <LineAnswers snapshot={snapshot} answers={answers} onChange={(no, a) => setAnswers((p) => ({ ...p, [no]: a }))} errors={errors} idPrefix={`desk-${snapshot.request}`} />
      <p aria-live="polite">
        Authorised with these answers: <strong>{money(t.authorised.totalMinor)}</strong> of {money(snapshot.totals.totalMinor)} estimated.
      </p>
      <label className="flex min-h-tap cursor-pointer items-center gap-3 text-ink">
        <input type="checkbox" className="size-5 accent-oil" checked={partsBack} onChange={(e) => setPartsBack(e.target.checked)} />
        They want the replaced parts back
      </label>
      <Field id={`note-${snapshot.request}`} label="Note (optional)" error={errors.note?.[0]}>
        <Textarea rows={2} value={note} maxLength={500} onChange={(e) => setNote(e.target.value)} />
      </Field>
      {error ? <Alert tone="error">{error}</Alert> : null}
      {confirming ? (
        <div role="group" aria-label="Confirm the answer" className="flex flex-wrap items-center gap-2 rounded-lg bg-oil-soft p-3">
          <span className="flex-1 font-semibold text-ink">
            Record {t.approvedCount} approved and {t.declinedCount} declined for {person.trim() || "the owner"}? It can&apos;t be changed afterwards.
          </span>
          <Button loading={busy} onClick={() => void record()}>
            Record the answer
          </Button>
          <Button variant="secondary" onClick={() => setConfirming(false)}>
            Check again
          </Button>
        </div>
      ) : (
        <div className="flex flex-wrap gap-2">
          <Button onClick={() => setConfirming(true)}>Review and record</Button>
          <Button variant="ghost" onClick={() => setOpen(false)}>
            Cancel
          </Button>
        </div>
      )}
    </div>
  );
}
