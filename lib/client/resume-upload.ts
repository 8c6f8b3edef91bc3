// Resuming a clip's direct upload after a reload (issue 20 §2). @mux/upchunk carries an upload
// across a dropped connection while the page lives, but always starts at byte 0 (3.5 has no
// option to start elsewhere), so a queued clip whose upload already began asks the upload URL how
// much it holds (`Content-Range: bytes */TOTAL` → 308 with `Range: bytes=0-N`, the resumable
// protocol the video service speaks) and sends only the rest, in the same chunks. fetch only, no
// DOM: tested in Node against the video fake (tests/integration/resume-upload.test.ts).

export type OffsetAnswer = { state: "complete" } | { state: "partial"; offset: number } | { state: "refused"; status: number; message: string };
export type RangeResult = { ok: true } | { ok: false; status: number; message: string };

const RETRYABLE = new Set([0, 408, 429, 500, 502, 503, 504]);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** "bytes=0-N" → N + 1; no header → 0. */
export function offsetFromRange(range: string | null): number {
  const m = range ? /^bytes=0-(\d+)$/.exec(range.trim()) : null;
  return m ? Number(m[1]) + 1 : 0;
}

/** Asks the upload URL how many bytes it already holds. */
export async function askOffset(uploadUrl: string, total: number): Promise<OffsetAnswer> {
  let res: Response;
  try {
    res = await fetch(uploadUrl, { method: "PUT", headers: { "content-range": `bytes */${total}` } });
  } catch {
    return { state: "refused", status: 0, message: "No connection to the video service." };
  }
  const text = await res.text().catch(() => "");
  if (res.status === 200 || res.status === 201) return { state: "complete" };
  if (res.status === 308) return { state: "partial", offset: offsetFromRange(res.headers.get("range")) };
  return { state: "refused", status: res.status, message: text.trim() || `The video service answered ${res.status}.` };
}

/**
 * Sends `file` from `offset` to the end in chunks of `chunkBytes` (a multiple of 256 KiB, as the
 * service requires of every chunk but the last). After each 308 it carries on from what the
 * service says it holds; a dropped connection or a gateway error is retried (5 tries per chunk).
 */
export async function sendFrom(
  uploadUrl: string,
  file: Blob,
  offset: number,
  opts: { chunkBytes: number; onProgress?: (fraction: number) => void; retryDelayMs?: number },
): Promise<RangeResult> {
  const total = file.size;
  let at = offset;
  let tries = 0;
  while (at < total) {
    const end = Math.min(at + opts.chunkBytes, total) - 1;
    let status = 0;
    let range: string | null = null;
    let text = "";
    try {
      const res = await fetch(uploadUrl, {
        method: "PUT",
        headers: { "content-type": file.type || "application/octet-stream", "content-range": `bytes ${at}-${end}/${total}` },
        body: file.slice(at, end + 1),
      });
      status = res.status;
      range = res.headers.get("range");
      text = await res.text().catch(() => "");
    } catch {
      status = 0;
    }
    if (status === 200 || status === 201) {
      opts.onProgress?.(1);
      return { ok: true };
    }
    if (status === 308) {
      const held = offsetFromRange(range);
      // Progress resets the tries; a 308 that holds no more than before counts as a failed try.
      if (held > at) tries = 0;
      else tries++;
      at = held;
      opts.onProgress?.(at / total);
    } else if (RETRYABLE.has(status)) {
      tries++;
      // After a dropped chunk, ask where the service got to before sending again.
      const asked = await askOffset(uploadUrl, total);
      if (asked.state === "complete") return { ok: true };
      if (asked.state === "partial") at = asked.offset;
    } else {
      return { ok: false, status, message: text.trim() || `The video service answered ${status}.` };
    }
    if (tries >= 5) return { ok: false, status: status === 308 ? 503 : status, message: "The video service stopped taking the clip; it will be tried again." };
    if (tries > 0) await sleep((opts.retryDelayMs ?? 1000) * tries);
  }
  // Everything was sent but the last answer wasn't a 200: ask once more.
  const last = await askOffset(uploadUrl, total);
  return last.state === "complete" ? { ok: true } : { ok: false, status: 503, message: "The video service hasn't confirmed the whole clip yet; it will be tried again." };
}
