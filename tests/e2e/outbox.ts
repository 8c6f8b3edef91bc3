import type { Page } from "@playwright/test";
import { sql } from "./db";
import { STAFF } from "./personas";

// The phone's outbox (lib/client/bench-outbox.ts: IndexedDB "benchside-outbox", store "items")
// from a test's side, through the browser's own IndexedDB API in the page: what is waiting, and a
// post put there as the app would have left it (someone else's on a shared phone; a clip whose
// upload had begun), for the cases a test can't reach by using the screens alone.

/** The users.id the app records on posts queued by this staff persona. */
export async function staffUserId(persona: keyof typeof STAFF): Promise<number> {
  const [row] = await sql("SELECT id FROM users WHERE email = ?", [STAFF[persona].email]);
  return Number(row!.id);
}

/** A queued post as the app stores it; `seq` is given by the store. */
export type PlantedItem = {
  key: string;
  kind: "note" | "clip";
  job: string;
  label: string;
  payload: Record<string, unknown>;
  by: number | null;
  /** Files as text; kept as Blobs of `type`. */
  files?: { name: string; type: string; text: string }[];
  ticket?: { clipId: string; entryId: number; uploadUrl: string };
};

/** Puts a post in the page's outbox (then reload, or wait for the runner, to see it). */
export async function plantOutboxItem(page: Page, item: PlantedItem): Promise<void> {
  await page.evaluate(async (p) => {
    const db = await new Promise<IDBDatabase>((resolve, reject) => {
      const open = indexedDB.open("benchside-outbox", 1);
      // The same store the app makes on first use.
      open.onupgradeneeded = () => open.result.createObjectStore("items", { keyPath: "seq", autoIncrement: true });
      open.onsuccess = () => resolve(open.result);
      open.onerror = () => reject(open.error);
    });
    const files = (p.files ?? []).map((f) => {
      const blob = new Blob([f.text], { type: f.type });
      return { name: f.name, type: f.type, size: blob.size, blob };
    });
    const value = { ...p, files, createdAt: Date.now(), attempts: 0, state: "waiting", lastError: null, nextAttemptAt: 0 };
    await new Promise<void>((resolve, reject) => {
      const tx = db.transaction("items", "readwrite");
      tx.objectStore("items").add(value);
      tx.oncomplete = () => resolve();
      tx.onerror = () => reject(tx.error);
    });
    db.close();
  }, item);
}

/** How many posts the page's outbox holds, and whose (`by`) they are. */
export async function outboxHolds(page: Page): Promise<{ by: number | null; state: string }[]> {
  return page.evaluate(async () => {
    const db = await new Promise<IDBDatabase>((resolve, reject) => {
      const open = indexedDB.open("benchside-outbox", 1);
      open.onupgradeneeded = () => open.result.createObjectStore("items", { keyPath: "seq", autoIncrement: true });
      open.onsuccess = () => resolve(open.result);
      open.onerror = () => reject(open.error);
    });
    const all = await new Promise<{ by?: number | null; state: string }[]>((resolve, reject) => {
      const req = db.transaction("items").objectStore("items").getAll();
      req.onsuccess = () => resolve(req.result as { by?: number | null; state: string }[]);
      req.onerror = () => reject(req.error);
    });
    db.close();
    return all.map((i) => ({ by: i.by ?? null, state: i.state }));
  });
}
