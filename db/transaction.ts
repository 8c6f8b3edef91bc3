import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import type { Knex } from "knex";
import { db } from "@/db/client";

/** The handle a transaction gives its work; pass it on to db/queries functions, never query with it outside db/. */
export type Tx = Knex.Transaction;

/** MariaDB's "lost a deadlock" (1213) and "lock wait timed out" (1205): the whole transaction may simply run again. */
export function isLockConflict(error: unknown): boolean {
  const e = error as { code?: unknown; errno?: unknown } | null;
  return e?.code === "ER_LOCK_DEADLOCK" || e?.code === "ER_LOCK_WAIT_TIMEOUT" || e?.errno === 1213 || e?.errno === 1205;
}

const ATTEMPTS = 4;
/** The transaction opened by enclosingTransaction, if the current call runs inside one. */
const enclosing = new AsyncLocalStorage<Tx>();
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Runs `work` in one transaction: committed when it resolves, rolled back when it throws. The one
 * way code (in db/ and outside it) makes a change of several statements, and the one place that
 * retries: a transaction that loses a deadlock or a lock wait is rolled back whole and run again,
 * up to 4 attempts, after a jittered pause (full jitter, 25 ms doubling), so two writers that
 * collided don't collide again in step. `work` may therefore run more than once: it must not
 * have effects outside the database that can't be repeated (mail goes through the outbox; a call
 * to a hosted service inside it needs an idempotency key).
 */
export async function transaction<T>(work: (tx: Tx) => Promise<T>): Promise<T> {
  // Inside enclosingTransaction: join it as a savepoint; the enclosing one retries as a whole
  // (a lost deadlock rolls back the whole transaction in MariaDB, so a savepoint can't retry).
  const outer = enclosing.getStore();
  if (outer) return outer.transaction(work);
  for (let attempt = 1; ; attempt++) {
    try {
      return await db().transaction(work);
    } catch (error) {
      if (attempt >= ATTEMPTS || !isLockConflict(error)) throw error;
      console.warn(`database: a transaction lost a lock conflict (${(error as { code?: string }).code}); attempt ${attempt + 1} of ${ATTEMPTS}`);
      await sleep(Math.random() * 25 * 2 ** attempt);
    }
  }
}

/**
 * Runs `work` in one transaction that every `transaction()` called inside it joins (as a
 * savepoint), so a record written around an existing writer — an idempotency key and its answer
 * (lib/server/idempotency.ts) — commits or rolls back with that writer's change.
 */
export function enclosingTransaction<T>(work: (tx: Tx) => Promise<T>): Promise<T> {
  return transaction((tx) => enclosing.run(tx, () => work(tx)));
}
