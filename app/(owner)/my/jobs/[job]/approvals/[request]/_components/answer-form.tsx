"use client";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { Alert, Button, ButtonLink, Card, Field, Input } from "@/components/ui";
import { LineAnswers } from "@/components/approvals/line-answers";
import { type LineAnswer, type RequestSnapshot, decisionTotals } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import { postDecision, type Refusal } from "@/lib/client/approvals";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";

type Props = { snapshot: RequestSnapshot; hash: string; jobPublicId: string; ownerName: string };

/**
 * The owner's answer: approve or decline each line, a running total against the estimate, the
 * name typed as a signature, parts back or not; then a review step before anything is recorded
 * (WCAG 3.3.4). A refusal (answered meanwhile, withdrawn, revised) says what to do next.
 */
export function AnswerForm({ snapshot, hash, jobPublicId, ownerName }: Props) {
  const router = useRouter();
  const [answers, setAnswers] = useState<Partial<Record<number, LineAnswer>>>({});
  const [signature, setSignature] = useState("");
  const [partsBack, setPartsBack] = useState(false);
  const [step, setStep] = useState<"choose" | "confirm">("choose");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [problem, setProblem] = useState<{ message: string; refusal?: Refusal } | null>(null);
  const [sending, setSending] = useState(false);
  const money = (n: number) => formatMoney(n, snapshot.currency);
  const t = useMemo(() => decisionTotals(snapshot, answers), [snapshot, answers]);
  const left = snapshot.lines.length - t.approvedCount - t.declinedCount;

  function review() {
    const found: Record<string, string[]> = {};
    for (const line of snapshot.lines) if (!answers[line.no]) found[`lines.${line.no}`] = [`Approve or decline “${line.description}”.`];
    if (!signature.trim()) found.signature = ["Type your name to sign."];
    setErrors(found);
    if (Object.keys(found).length === 0) setStep("confirm");
  }

  async function send() {
    setSending(true);
    setProblem(null);
    const lines = snapshot.lines.map((l) => ({ no: l.no, answer: answers[l.no]! }));
    const result = await postDecision(snapshot.request, { shownHash: hash, lines, signature: signature.trim(), wantsPartsBack: partsBack, confirmed: true });
    setSending(false);
    if (result.ok) return router.refresh();
    setProblem({ message: formBanner(result, FORM_VISIBLE.answer) ?? result.message, refusal: result.refusal });
    if (result.fields) setErrors(result.fields);
    if (result.refusal?.reason === "answered") router.refresh();
    setStep("choose");
  }

  const approved = snapshot.lines.filter((l) => answers[l.no] === "approved");
  const declined = snapshot.lines.filter((l) => answers[l.no] === "declined");
  const current = problem?.refusal?.current && problem.refusal.current !== snapshot.request ? problem.refusal.current : null;

  return (
    <Card as="section" title="Your answer" headingId="answer-heading" description="Approve or decline each line. Nothing is done until you confirm.">
      <div className="space-y-5">
        {problem ? (
          <Alert tone="error" title="Your answer wasn't recorded" action={current ? <ButtonLink href={`/my/jobs/${jobPublicId}/approvals/${current}`}>See the current version</ButtonLink> : undefined}>
            {problem.message}
          </Alert>
        ) : null}
        {step === "choose" ? (
          <>
            <LineAnswers snapshot={snapshot} answers={answers} onChange={(no, a) => setAnswers((prev) => ({ ...prev, [no]: a }))} errors={errors} idPrefix="owner" />
            <Totals estimate={money(snapshot.totals.totalMinor)} authorised={money(t.authorised.totalMinor)} left={left} />
            <Field id="signature" label="Type your full name to sign" hint={`For example “${ownerName}”. This is your signature on the answer.`} error={errors.signature?.[0]} required>
              <Input value={signature} onChange={(e) => setSignature(e.target.value)} autoComplete="name" maxLength={120} />
            </Field>
            <label className="flex min-h-tap cursor-pointer items-center gap-3 font-semibold text-ink">
              <input type="checkbox" className="size-6 accent-oil" checked={partsBack} onChange={(e) => setPartsBack(e.target.checked)} />I want the replaced parts back
            </label>
            <Button size="lg" fullWidth onClick={review}>
              Review my answer
            </Button>
          </>
        ) : (
          <div role="group" aria-labelledby="confirm-heading" className="space-y-4 rounded-xl border-2 border-oil bg-oil-soft p-4">
            <h3 id="confirm-heading" className="text-lg font-bold text-ink">
              Check your answer
            </h3>
            <p>
              <strong>You approve:</strong> {approved.length ? approved.map((l) => `${l.description} (${money(l.netMinor)})`).join(", ") : "nothing"}.
            </p>
            <p>
              <strong>You decline:</strong> {declined.length ? declined.map((l) => l.description).join(", ") : "nothing"}.
            </p>
            <p>
              <strong>New authorised total:</strong> {money(t.authorised.totalMinor)} including tax, against an estimate of {money(snapshot.totals.totalMinor)} for all lines.
            </p>
            <p>
              <strong>Replaced parts:</strong> {partsBack ? "you want them back" : "the shop may dispose of them"}. <strong>Signed:</strong> {signature.trim()}
            </p>
            <div className="flex flex-col gap-2 sm:flex-row">
              <Button size="lg" loading={sending} onClick={() => void send()}>
                Confirm and send my answer
              </Button>
              <Button size="lg" variant="secondary" disabled={sending} onClick={() => setStep("choose")}>
                Change my answer
              </Button>
            </div>
          </div>
        )}
      </div>
    </Card>
  );
}

function Totals({ estimate, authorised, left }: { estimate: string; authorised: string; left: number }) {
  return (
    <div aria-live="polite" className="space-y-2 rounded-xl bg-sunken p-4">
      <dl className="grid grid-cols-2 gap-3">
        <div>
          <dt className="text-sm text-ink-muted">Estimate, all lines</dt>
          <dd className="text-lg font-bold tabular-nums text-ink">{estimate}</dd>
        </div>
        <div>
          <dt className="text-sm text-ink-muted">You&apos;re approving</dt>
          <dd className="text-lg font-bold tabular-nums text-ink" data-testid="running-total">
            {authorised}
          </dd>
        </div>
      </dl>
      <p className="text-sm text-ink-muted">{left ? `${left} line${left === 1 ? "" : "s"} still to answer. Totals include tax.` : "Every line answered. Totals include tax."}</p>
    </div>
  );
}
