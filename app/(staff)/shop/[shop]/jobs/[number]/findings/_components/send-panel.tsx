"use client";
import { Send } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert, Button, Card } from "@/components/ui";
import { postSend } from "@/lib/client/approvals";

type Props = {
  jobPublicId: string;
  findingId: number;
  findingVersion: number;
  /** The estimate as saved, or why it can't be sent yet. */
  estimate: string | null;
  missing: string | null;
  to: string | null;
  /** The number the request's text goes to, when the owner chose texts and agreed to them. */
  textTo: string | null;
  openVersion: number | null;
  /** The open request already shows the finding as saved: nothing new to send. */
  upToDate: boolean;
  statusNote: string | null;
};

/** Send the saved finding to the owner (or a revision that replaces the open request), after a confirm step. */
export function SendPanel({ jobPublicId, findingId, findingVersion, estimate, missing, to, textTo, openVersion, upToDate, statusNote }: Props) {
  const router = useRouter();
  const [confirming, setConfirming] = useState(false);
  const [sending, setSending] = useState(false);
  const [message, setMessage] = useState<{ tone: "error" | "success"; text: string } | null>(null);

  async function send() {
    setSending(true);
    const result = await postSend(jobPublicId, findingId, findingVersion);
    setSending(false);
    setConfirming(false);
    if (!result.ok) return setMessage({ tone: "error", text: result.message });
    const { mailed, texted } = result.data;
    const how = mailed && texted ? `${to} will get an e-mail and a text with a link to answer.` : mailed ? `${to} will get an e-mail with a button to answer.` : texted ? "The owner will get a text with a link to answer." : null;
    setMessage({ tone: "success", text: how ? `Sent. ${how}` : "Sent. There is no e-mail address on file: call the owner and note their answer below." });
    router.refresh();
  }

  const verb = openVersion ? `Send the revision (replaces version ${openVersion})` : "Send to the owner";
  return (
    <Card as="section" title={openVersion ? "Send a revision" : "Send for approval"} headingId="send-heading" description="What goes out is the finding as last saved: save your changes first.">
      <div className="space-y-3">
        {missing ? <Alert tone="warning" title="Not ready to send">{missing}</Alert> : <p>Estimate as saved: <strong>{estimate}</strong> with tax.</p>}
        <p className="text-ink-muted">{goesTo(to, textTo)}</p>
        {statusNote ? <p className="text-ink-muted">{statusNote}</p> : null}
        {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
        {upToDate ? (
          <p className="font-semibold text-ink">The owner has this version. To change it, edit and save the finding, then send the revision here.</p>
        ) : confirming ? (
          <div role="group" aria-label="Confirm sending" className="flex flex-wrap items-center gap-2 rounded-lg bg-oil-soft p-3">
            <span className="flex-1 font-semibold text-ink">{openVersion ? `Send this revision? Version ${openVersion} can no longer be answered.` : "Send this to the owner now?"}</span>
            <Button loading={sending} onClick={() => void send()} icon={<Send aria-hidden className="size-5" />}>
              Yes, send it
            </Button>
            <Button variant="secondary" onClick={() => setConfirming(false)}>
              Not yet
            </Button>
          </div>
        ) : (
          <Button size="lg" fullWidth disabled={!!missing} onClick={() => setConfirming(true)} icon={<Send aria-hidden className="size-5" />}>
            {verb}
          </Button>
        )}
      </div>
    </Card>
  );
}

/** Where the request will go, as the owner chose (e-mail, text or both). */
function goesTo(email: string | null, text: string | null): string {
  if (email && text) return `The request goes by e-mail to ${email} and by text to ${text}.`;
  if (email) return `The request e-mail goes to ${email}.`;
  if (text) return `The request goes by text to ${text}.`;
  return "No e-mail address on file and no texts agreed: after sending, note the owner's answer by phone or in person.";
}
