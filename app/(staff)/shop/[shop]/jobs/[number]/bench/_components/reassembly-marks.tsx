"use client";
import { SquareCheck, Undo2 } from "lucide-react";
import { useState } from "react";
import { ActionButton } from "@/components/bench/action-form";
import { Alert } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { isQueued, offlineCapable } from "@/lib/client/queue-post";
import { markReplacedAction, tickStepAction } from "../actions";

type Props = { jobPublicId: string; stepId: string; removed: string; done: boolean; replacedNew: boolean };

/**
 * A checklist item's "Mark done" and "Mark replaced with new". With no network each mark waits in
 * the phone's outbox (the reassembly-ticks / reassembly-replaced routes) and the button already
 * shows the mark, so the next tap undoes it; the server's own state comes with the next page load.
 * The section keys this on the server's values, so a fresh page starts from them again.
 */
export function ReassemblyMarks({ jobPublicId, stepId, removed, done: savedDone, replacedNew: savedReplaced }: Props) {
  const [queuedDone, setQueuedDone] = useState<boolean | null>(null);
  const [queuedReplaced, setQueuedReplaced] = useState<boolean | null>(null);
  const done = queuedDone ?? savedDone;
  const replaced = queuedReplaced ?? savedReplaced;
  const fields = (value: boolean) => ({ job: jobPublicId, step: stepId, value: value ? "1" : "0" });
  // Sets the shown mark once the post was queued (an online post refreshes the page instead).
  const queuing = <T,>(action: (prev: ActionState<T>, form: FormData) => Promise<ActionState<T>>, shown: (value: boolean) => void) => async (prev: ActionState<T>, form: FormData) => {
    const result = await action(prev, form);
    if (result?.ok && isQueued(result.data)) shown(form.get("value") === "1");
    return result;
  };
  const tick = queuing(offlineCapable(tickStepAction, { kind: "tick", job: jobPublicId, label: (f) => (f.get("value") === "1" ? `Mark done: ${removed}` : `Undo done: ${removed}`) }), setQueuedDone);
  const replace = queuing(
    offlineCapable(markReplacedAction, { kind: "replaced", job: jobPublicId, label: (f) => (f.get("value") === "1" ? `Replaced with new: ${removed}` : `Undo replaced with new: ${removed}`) }),
    setQueuedReplaced,
  );
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2">
        <ActionButton
          action={tick}
          fields={fields(!done)}
          variant={done ? "secondary" : "primary"}
          icon={done ? <Undo2 aria-hidden className="size-5" /> : <SquareCheck aria-hidden className="size-5" />}
        >
          {done ? `Undo: ${removed}` : `Mark done: ${removed}`}
        </ActionButton>
        <ActionButton action={replace} fields={fields(!replaced)} variant="ghost">
          {replaced ? "Undo replaced with new" : "Mark replaced with new"}
        </ActionButton>
      </div>
      {queuedDone !== null || queuedReplaced !== null ? (
        <Alert tone="info" title="Kept on this phone">
          No network right now: {queuedDone !== null && queuedReplaced !== null ? "these marks are" : "this mark is"} sent by itself, in order, when the connection is back (see “Waiting to send”).
        </Alert>
      ) : null}
    </div>
  );
}
