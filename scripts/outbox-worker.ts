// The mail worker: renders due notifications into the outbox and sends the outbox through the
// resend SDK, until SIGTERM or Ctrl-C. `npm start` and `npm test` run it beside the app:
//   node node_modules/tsx/dist/cli.mjs --tsconfig tsconfig.worker.json scripts/outbox-worker.ts
// A process of its own rather than a loop inside the app: rendering digests and waiting on the
// mail API never share an event loop with page requests, app hosts stay plain request servers
// while workers are started, scaled or stopped on their own (OUTBOX_WORKER=off), and it runs
// exactly the code the integration tests run. Any number may run at once (rows are claimed
// with SKIP LOCKED). Settings: OUTBOX_* and DAILY_DIGEST_HOUR in .env.example.
import { db } from "@/db/client";
import { startOutboxWorker } from "@/lib/server/outbox-worker";

const intervalMs = Number(process.env.OUTBOX_POLL_MS ?? 2000);
if (!Number.isFinite(intervalMs) || intervalMs < 100) throw new Error(`OUTBOX_POLL_MS must be a number of milliseconds ≥ 100, got "${process.env.OUTBOX_POLL_MS}"`);

const worker = startOutboxWorker({ intervalMs });
console.log(`outbox worker: polling every ${intervalMs} ms`);

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  await worker.stop();
  await db().destroy();
  process.exit(0);
}
process.on("SIGINT", () => void stop());
process.on("SIGTERM", () => void stop());
