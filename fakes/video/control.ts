// /_fake/* routes: the shared switches (fail, drop webhooks, delivery log, reset) plus failing upload
// chunks and delaying processing. No auth, because the server only answers loopback clients.
import { errorStatus, failureCount, handleSwitchboard, parseJsonObject, type Switchboard } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import type { FakeContext } from "./context";
import { invalidParameter, MuxApiError } from "./errors";

const MAX_DELAY_MS = 10 * 60 * 1000;

const BOARD: Switchboard<FakeContext> = {
  invalid: invalidParameter,
  notFound: (message) => new MuxApiError(404, "not_found", message),
  counts: ({ store }) => ({ uploads: store.uploads.size, assets: store.assets.size }),
  switches: ({ chunkFailures, processor }) => ({ pending_chunk_failures: chunkFailures.pending, processing_delay_ms: processor.delayMs }),
  routes: (ctx, status) => ({
    "POST /_fake/fail-chunks": ({ body }) => {
      const input = parseJsonObject(body, '{"count": 1, "status": 503} or {"count": 1, "drop": true}', invalidParameter);
      const count = failureCount(input.count, invalidParameter);
      ctx.chunkFailures.arm(count, input.drop === true ? { drop: true } : { status: errorStatus(input.status, 503, invalidParameter) });
      return status();
    },
    "DELETE /_fake/fail-chunks": () => {
      ctx.chunkFailures.clear();
      return status();
    },
    "POST /_fake/delay": ({ body }) => {
      const ms = parseJsonObject(body, '{"ms": 2000}', invalidParameter).ms;
      if (typeof ms !== "number" || !Number.isInteger(ms) || ms < 0 || ms > MAX_DELAY_MS) throw invalidParameter(`ms must be a whole number from 0 to ${MAX_DELAY_MS}.`);
      ctx.processor.delayMs = ms;
      return status();
    },
  }),
  reset: ({ chunkFailures, processor }, everything) => {
    chunkFailures.clear();
    processor.delayMs = 0;
    if (everything) processor.abortAll();
  },
};

export function handleControl(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: FakeContext): Promise<JsonResponse> {
  return handleSwitchboard(ctx, BOARD, { method, pathname, query, body });
}
