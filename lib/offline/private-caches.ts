// The window's side of the offline caches: what one person may see is dropped when they leave.
import { CACHE_OWNER_KEY, PRIVATE_CACHES } from "./cache-rules";

/** Empties the caches of pages and photos (sign-out; someone else signing in on this browser). */
export async function clearPrivateCaches(): Promise<void> {
  if (typeof caches === "undefined") return;
  await Promise.all(PRIVATE_CACHES.map((name) => caches.delete(name).catch(() => false)));
}

/** Sign-out: empty the caches and forget whose they were. */
export async function forgetOfflineCopies(): Promise<void> {
  try {
    localStorage.removeItem(CACHE_OWNER_KEY);
  } catch {
    // Storage switched off: nothing was remembered.
  }
  await clearPrivateCaches();
}

/**
 * Before the worker keeps anything for `userId`: if the caches were filled for someone else (a
 * shared phone whose last user's session simply ran out), empty them first.
 */
export async function claimOfflineCopies(userId: string): Promise<void> {
  let before: string | null = null;
  try {
    before = localStorage.getItem(CACHE_OWNER_KEY);
  } catch {
    // No storage: treat every visit as a new person's.
  }
  if (before === userId) return;
  await clearPrivateCaches();
  try {
    localStorage.setItem(CACHE_OWNER_KEY, userId);
  } catch {
    // As above.
  }
}
