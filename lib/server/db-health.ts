import "server-only";
import { pingDatabase } from "@/db/queries/health";

// Whether the database answers, as the proxy needs it to give pages and server actions a real
// 503 (a page's error boundary can't set a status once Next has started rendering). Checked at
// most once a second while all is well, at once after any request saw the database fail, and
// kept on globalThis because the proxy and the pages are bundled apart in one process.

type State = { up: boolean; checkedAt: number; suspect: boolean; pending: Promise<boolean> | null };
const KEY = Symbol.for("benchside.db-health");
const holder = globalThis as typeof globalThis & { [KEY]?: State };
const state = (holder[KEY] ??= { up: true, checkedAt: 0, suspect: false, pending: null });

const HEALTHY_RECHECK_MS = 1000;
const PING_TIMEOUT_MS = 1000;

/** A request saw the database fail: the next look asks it again rather than trusting the last answer. */
export function reportDatabaseUnavailable(): void {
  state.suspect = true;
}

/** True when the database answered within a second, on a check no older than a second (one ping at a time). */
export async function databaseAnswers(now = Date.now()): Promise<boolean> {
  if (state.up && !state.suspect && now - state.checkedAt < HEALTHY_RECHECK_MS) return true;
  if (!state.up && now - state.checkedAt < 250 && !state.pending) return false;
  state.pending ??= (async () => {
    try {
      await Promise.race([pingDatabase(), new Promise((_, reject) => setTimeout(() => reject(new Error("timed out")), PING_TIMEOUT_MS).unref())]);
      state.up = true;
    } catch {
      state.up = false;
    } finally {
      state.checkedAt = Date.now();
      state.suspect = false;
      state.pending = null;
    }
    return state.up;
  })();
  return state.pending;
}
