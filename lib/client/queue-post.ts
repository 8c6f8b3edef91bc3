"use client";
// Lets a bench form keep working with no network (issue 20 §2): when the browser is offline, or
// the action couldn't be reached at all (no answer; an action id from an older build), the form's
// fields go into the outbox and are sent to the matching route with an idempotency key. A change
// that can't wait (it is checked against what is on screen) says it needs a connection instead.
import { useSyncExternalStore } from "react";
import type { ActionState } from "@/lib/action";
import { type OutboxKind, browserOffline, enqueue, formPayload } from "./bench-outbox";

type Action<T> = (prev: ActionState<T>, formData: FormData) => Promise<ActionState<T>>;
export type Queued = { queued: true };

export const isQueued = (data: unknown): data is Queued => !!data && typeof data === "object" && (data as Queued).queued === true;

export function offlineCapable<T>(action: Action<T>, how: { kind: Exclude<OutboxKind, "photos" | "clip">; job: string; label: (form: FormData) => string }): Action<T | Queued> {
  return async (prev, form) => {
    const queue = async (): Promise<ActionState<Queued>> => {
      await enqueue({ kind: how.kind, job: how.job, label: how.label(form), payload: formPayload(form) });
      return { ok: true, data: { queued: true } };
    };
    if (browserOffline()) return queue();
    try {
      return await action(prev as ActionState<T>, form);
    } catch {
      // The action's own refusals come back as a state; a throw means it was never reached.
      return queue();
    }
  };
}

/**
 * For a change that is not queued: with no network (or no answer) the form gets `message` as its
 * refusal, with what was typed kept, instead of an error thrown out of the action.
 */
export function onlineOnly<T>(action: Action<T>, message: string): Action<T> {
  return async (prev, form) => {
    const refused: ActionState<T> = { ok: false, values: formPayload(form), error: { code: "unavailable", message } };
    if (browserOffline()) return refused;
    try {
      return await action(prev, form);
    } catch {
      return refused;
    }
  };
}

function onNetworkChange(listener: () => void) {
  window.addEventListener("online", listener);
  window.addEventListener("offline", listener);
  return () => {
    window.removeEventListener("online", listener);
    window.removeEventListener("offline", listener);
  };
}
/** Whether the browser says it has no network, kept up to date (false while rendering on the server). */
export const useBrowserOffline = () => useSyncExternalStore(onNetworkChange, browserOffline, () => false);
