// How each kind of queued post reaches the server (issue 20 §2), with its Idempotency-Key on
// every request that writes: route handlers only (app/api/jobs/[job]/…), since a server action's
// id changes between builds and a phone may replay a post made before an update.
import { CLIP_CHUNK_KIB } from "@/lib/clips";
import { type ClipTicket, type OutboxItem, type QueuedFile, type SendContext, type SendResult, type Sender, failureOutcome } from "./bench-outbox";
import { askOffset, sendFrom } from "./resume-upload";
import { uploadFile } from "./upload";

type Answer<T> = { ok: true; data: T } | { ok: false; status: number; message: string };

/** The route (under /api/jobs/:job/) of each kind posted as one JSON body. */
const PATHS: Record<Exclude<OutboxItem["kind"], "photos" | "clip">, string> = {
  note: "entries",
  torque: "torque-records",
  reading: "readings",
  chain: "chain-readings",
  measurements: "measurement-sets",
  teardown: "teardown-steps",
  "step-torque": "step-torques",
  tick: "reassembly-ticks",
  replaced: "reassembly-replaced",
  status: "status",
};

/** POST JSON with the item's key; a refusal's per-field messages are said in the message (no field is on screen). */
async function postKeyed<T>(url: string, body: unknown, key: string): Promise<Answer<T>> {
  let res: Response;
  try {
    res = await fetch(url, { method: "POST", headers: { "content-type": "application/json", accept: "application/json", "idempotency-key": key }, body: JSON.stringify(body) });
  } catch {
    return { ok: false, status: 0, message: "No connection to Benchside." };
  }
  const data = (await res.json().catch(() => null)) as (T & { error?: { message?: string; fields?: Record<string, string[]> } }) | null;
  if (res.ok) return { ok: true, data: data as T };
  const said = [...new Set(Object.values(data?.error?.fields ?? {}).map((m) => m[0]))].filter(Boolean);
  return { ok: false, status: res.status, message: said.length ? said.join(" ") : (data?.error?.message ?? `Benchside answered ${res.status}.`) };
}

const asFile = (f: QueuedFile) => new File([f.blob], f.name, { type: f.type });

async function sendPhotos(item: OutboxItem, ctx: SendContext): Promise<SendResult> {
  const files = [...item.files];
  const todo = files.filter((f) => !f.sentAs).length;
  let done = 0;
  for (const [i, f] of files.entries()) {
    if (f.sentAs) continue;
    const up = await uploadFile<{ photo: { id: string } }>(`/api/jobs/${item.job}/photos`, "photo", asFile(f), (p) => ctx.progress((done + p) / (todo + 1)));
    // Named, so a refusal (not a photo, too large) says which file it was.
    if (!up.ok) return { ok: false, status: up.status, message: `${f.name}: ${up.message}` };
    files[i] = { ...f, sentAs: up.data.photo.id };
    await ctx.save({ files });
    done++;
  }
  const posted = await postKeyed(`/api/jobs/${item.job}/entries`, { ...item.payload, kind: "photos", photoIds: files.map((f) => f.sentAs) }, item.key);
  // Photos kept too long unposted are cleared by the server: upload them again on the next try.
  if (!posted.ok && posted.status === 404) await ctx.save({ files: files.map((f) => ({ ...f, sentAs: undefined })) });
  return posted.ok ? { ok: true } : posted;
}

/** A fresh upload with UpChunk: it pauses itself offline and carries on when the network is back. */
async function upchunkFromStart(url: string, file: File, ctx: SendContext): Promise<SendResult> {
  const { createUpload } = await import("@mux/upchunk");
  return new Promise((resolve) => {
    // A dropped connection reaches upchunk as status 0: retried like a gateway error.
    const upload = createUpload({ endpoint: url, file, chunkSize: CLIP_CHUNK_KIB, attempts: 10, delayBeforeAttempt: 2, retryCodes: [0, 408, 502, 503, 504] });
    upload.on("progress", (e) => ctx.progress(Number(e.detail) / 100));
    upload.on("success", () => resolve({ ok: true }));
    // Given up: the next attempt asks the upload URL what arrived and sends only the rest.
    upload.on("error", (e) => resolve({ ok: false, status: 0, message: `The clip upload stopped: ${(e.detail as { message?: string })?.message ?? "the connection failed"}.` }));
  });
}

/** Whether the clip's entry is still on the job's timeline (the newest entry up to its id is it); null when that couldn't be asked. */
async function clipEntryKept(job: string, entryId: number): Promise<boolean | null> {
  try {
    const res = await fetch(`/api/jobs/${job}/timeline?order=desc&after=${entryId + 1}&limit=1`, { headers: { accept: "application/json" } });
    if (!res.ok) return null;
    const page = (await res.json()) as { entries?: { id: number }[] };
    return page.entries?.[0]?.id === entryId;
  } catch {
    return null;
  }
}

/**
 * The upload URL turned the clip down. Deleting a clip's entry closes its upload at the video
 * service (lib/server/journal.ts): when that is why, the item says so rather than the service's words.
 */
async function uploadRefused(item: OutboxItem, ticket: ClipTicket, name: string, refused: { status: number; message: string }): Promise<SendResult> {
  if (refused.status === 0) return { ok: false, ...refused };
  if ((await clipEntryKept(item.job, ticket.entryId)) === false) {
    return { ok: false, status: 409, message: `The clip's entry was deleted from the job's timeline meanwhile, so the rest of ${name} was not uploaded.` };
  }
  return { ok: false, status: refused.status, message: `The video service no longer takes this clip's upload (${refused.message}). Discard it and post ${name} again.` };
}

async function sendClip(item: OutboxItem, ctx: SendContext): Promise<SendResult> {
  const f = item.files[0];
  if (!f) return { ok: false, status: 422, message: "The clip's file is missing from this phone." };
  let ticket = item.ticket;
  if (!ticket) {
    const made = await postKeyed<{ clipId: string; entryId: number; uploadUrl: string }>(`/api/jobs/${item.job}/clips`, item.payload, item.key);
    if (!made.ok) return made.status === 422 ? { ...made, message: `${f.name}: ${made.message}` } : made;
    ticket = made.data;
    await ctx.save({ ticket });
  }
  const asked = await askOffset(ticket.uploadUrl, f.size);
  if (asked.state === "complete") return { ok: true };
  if (asked.state === "refused") return uploadRefused(item, ticket, f.name, asked);
  if (asked.offset === 0) return upchunkFromStart(ticket.uploadUrl, asFile(f), ctx);
  ctx.progress(asked.offset / f.size);
  const sent = await sendFrom(ticket.uploadUrl, f.blob, asked.offset, { chunkBytes: CLIP_CHUNK_KIB * 1024, onProgress: ctx.progress });
  // Turned down part-way (not a dropped connection or a busy service, which are tried again).
  return sent.ok || failureOutcome(sent.status) === "retry" ? sent : uploadRefused(item, ticket, f.name, sent);
}

/** The outbox's one sender: picks the route by kind. */
export const sendQueued: Sender = async (item, ctx) => {
  if (item.kind === "photos") return sendPhotos(item, ctx);
  if (item.kind === "clip") return sendClip(item, ctx);
  const answer = await postKeyed(`/api/jobs/${item.job}/${PATHS[item.kind]}`, item.payload, item.key);
  return answer.ok ? { ok: true } : answer;
};
