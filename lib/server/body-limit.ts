import "server-only";
import { AppError } from "@/lib/errors";
import { WEBHOOK_MAX_BYTES } from "@/lib/schemas/webhooks";

// Request bodies are read with their limit enforced while they stream in: bytes are counted as
// they arrive and reading stops at the limit, so a body with no Content-Length (chunked) or a
// false one can't make the server hold more than the limit. Content-Length alone is only a hint.
//
// At the limit we stop pulling but don't cancel the request body at once: under Node, cancelling
// it destroys the socket, and the client would get a reset instead of the 413. The refusal should
// carry `Connection: close` (see CLOSE_AFTER_REFUSAL) so Node closes the socket once the answer is
// written; as a fallback the body is cancelled (socket destroyed) a moment later in any case, so a
// client that keeps sending can't hold the connection open.

/** How long a refused body is left unread before it is cancelled (the answer is written by then). */
const LINGER_MS = 2_000;

/** Headers for a response that refuses a body part-way: the unread rest must not stall the connection. */
export const CLOSE_AFTER_REFUSAL = { connection: "close" } as const;

/** "20 MB", "1 MB", "256 KB": how limits are said in messages. */
export function sizeLabel(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Math.round((bytes / 1024 / 1024) * 10) / 10} MB`;
  return `${Math.max(1, Math.round(bytes / 1024))} KB`;
}

export type BodyLimitOptions = {
  /** The 413's message; "The request body is larger than <limit>." unless given. */
  message?: string;
};

function tooLarge(maxBytes: number, opts: BodyLimitOptions): AppError {
  return new AppError("too_large", opts.message ?? `The request body is larger than ${sizeLabel(maxBytes)}.`);
}

/** The declared length, if any: a refusal before reading when it is already over the limit. */
function declaredLength(req: Request): number | null {
  const raw = req.headers.get("content-length");
  if (raw === null || !/^\d{1,16}$/.test(raw.trim())) return null;
  return Number(raw.trim());
}

function stopLater(reader: ReadableStreamDefaultReader<Uint8Array>) {
  setTimeout(() => void reader.cancel().catch(() => undefined), LINGER_MS).unref?.();
}

/**
 * The request body as a stream that ends in `AppError("too_large")` once more than `maxBytes`
 * have arrived, and in `AppError("bad_request")` if the client breaks off. Throws at once when
 * Content-Length already says too much (nothing is read then). Null when there is no body.
 * Call it once per request; the original body is locked by it.
 */
export function cappedBody(req: Request, maxBytes: number, opts: BodyLimitOptions = {}): ReadableStream<Uint8Array> | null {
  const declared = declaredLength(req);
  if (declared !== null && declared > maxBytes) throw tooLarge(maxBytes, opts);
  if (!req.body) return null;
  if (req.bodyUsed) throw new AppError("bad_request", "The request body was already read.");
  const reader = req.body.getReader();
  let seen = 0;
  let stopped = false;
  const stop = () => {
    if (stopped) return;
    stopped = true;
    stopLater(reader);
  };
  return new ReadableStream<Uint8Array>(
    {
      async pull(controller) {
        let chunk: ReadableStreamReadResult<Uint8Array>;
        try {
          chunk = await reader.read();
        } catch {
          stopped = true;
          controller.error(new AppError("bad_request", "The upload was cut off before it finished; try again."));
          return;
        }
        if (chunk.done) {
          stopped = true;
          controller.close();
          return;
        }
        seen += chunk.value.byteLength;
        if (seen > maxBytes) {
          controller.error(tooLarge(maxBytes, opts));
          stop();
          return;
        }
        controller.enqueue(chunk.value);
      },
      // The reader of this stream gave up (a parse error, say): leave the rest unread, as above.
      cancel: stop,
    },
    // Pull only when asked: nothing is read ahead of the consumer.
    { highWaterMark: 0 },
  );
}

/** The whole body as bytes, at most `maxBytes` of it (413 beyond, without reading further). */
export async function readBodyCapped(req: Request, maxBytes: number, opts: BodyLimitOptions = {}): Promise<Buffer> {
  const stream = cappedBody(req, maxBytes, opts);
  if (!stream) return Buffer.alloc(0);
  const chunks: Uint8Array[] = [];
  let total = 0;
  const reader = stream.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    total += value.byteLength;
  }
  return Buffer.concat(chunks, total);
}

/**
 * The body as text, exactly as sent (UTF-8, a byte-order mark kept): what a webhook signature is
 * computed over.
 */
export async function readTextCapped(req: Request, maxBytes: number, opts: BodyLimitOptions = {}): Promise<string> {
  return new TextDecoder("utf-8", { ignoreBOM: true }).decode(await readBodyCapped(req, maxBytes, opts));
}

/** The body parsed as JSON: 413 over the limit, 400 when it is empty or not JSON. */
export async function readJsonCapped(req: Request, maxBytes: number, opts: BodyLimitOptions = {}): Promise<unknown> {
  const text = await readTextCapped(req, maxBytes, opts);
  if (!text.trim()) throw new AppError("bad_request", "The request body is empty; send JSON.");
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
}

/**
 * A copy of the request whose body stops at `maxBytes`, for parsers that take a Request
 * (`request.formData()`). Prefer `readFormDataCapped`, which also names the failure.
 */
export function cappedRequest(req: Request, maxBytes: number, opts: BodyLimitOptions = {}): Request {
  const body = cappedBody(req, maxBytes, opts);
  return new Request(req.url, { method: req.method, headers: req.headers, body, duplex: "half" } as RequestInit);
}

/**
 * A small form (url-encoded or multipart) read whole, capped at `maxBytes`. Files in it are held
 * in memory: for uploads, stream them with `receiveFile` (lib/server/multipart-file.ts) instead.
 */
export async function readFormDataCapped(req: Request, maxBytes: number, opts: BodyLimitOptions = {}): Promise<FormData> {
  let failure = null as AppError | null;
  const body = cappedBody(req, maxBytes, opts);
  // Keep the stream's own error: the form parser reports any failure as a plain TypeError.
  const tap = body ? watchErrors(body, (error) => (failure = error)) : null;
  const copy = new Request(req.url, { method: req.method, headers: req.headers, body: tap, duplex: "half" } as RequestInit);
  try {
    return await copy.formData();
  } catch {
    throw failure ?? new AppError("bad_request", "The form was cut off or is not valid form data; try again.");
  }
}

/** Passes a stream through, noting the AppError it ends in. */
function watchErrors(stream: ReadableStream<Uint8Array>, onError: (error: AppError) => void): ReadableStream<Uint8Array> {
  const reader = stream.getReader();
  return new ReadableStream<Uint8Array>(
    {
      async pull(controller) {
        try {
          const { done, value } = await reader.read();
          if (done) controller.close();
          else controller.enqueue(value);
        } catch (error) {
          if (error instanceof AppError) onError(error);
          controller.error(error);
        }
      },
      cancel: (reason) => reader.cancel(reason),
    },
    { highWaterMark: 0 },
  );
}

/** A webhook delivery's raw body, at most 1 MB, read before (and whatever) its signature says. */
export function readWebhookBody(req: Request): Promise<string> {
  return readTextCapped(req, WEBHOOK_MAX_BYTES, { message: `Webhook bodies are at most ${sizeLabel(WEBHOOK_MAX_BYTES)}.` });
}
