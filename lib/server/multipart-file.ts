import "server-only";
import { createWriteStream, openAsBlob } from "node:fs";
import { mkdtemp, rm, stat } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import busboy from "busboy";
import { AppError } from "@/lib/errors";
import { cappedBody } from "@/lib/server/body-limit";

// One file from a multipart upload, streamed to a temporary file as it arrives, never held whole
// in memory: ten people sending 30 MB at once cost disk, not RAM. The body is capped while it
// streams (body-limit.ts) and the file part on its own, so an over-size upload stops being read
// at the limit and its temporary file is removed.

export type ReceivedFile = {
  /** The upload as a File backed by the temporary file (read lazily). */
  file: File;
  bytes: number;
  /** Removes the temporary file; call it when done (a `finally`). */
  dispose: () => Promise<void>;
};

export type ReceiveFileOptions = {
  /** The form field that holds the file; other files are skipped, other fields ignored. */
  field: string;
  maxFileBytes: number;
  /** The whole request's limit: the file plus the multipart envelope and small fields. */
  maxBodyBytes: number;
  /** The 413's message. */
  tooLargeMessage: string;
  /** The 422's message when the field holds no file; "Attach a file." unless given. */
  missingMessage?: string;
};

const CUT_OFF = "The upload was cut off or is not valid form data; try again.";

/**
 * Reads a multipart/form-data request, keeping only the file in `field`. Throws
 * AppError too_large (413) at the limit, bad_request (400) for a broken or non-multipart body,
 * invalid (422) when the field holds no file or an empty one.
 */
export async function receiveFile(req: Request, opts: ReceiveFileOptions): Promise<ReceivedFile> {
  const contentType = req.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\s*;.*boundary=/i.test(contentType)) throw new AppError("bad_request", "Send the file as multipart/form-data.");
  const body = cappedBody(req, opts.maxBodyBytes, { message: opts.tooLargeMessage });
  if (!body) throw missing(opts);

  const dir = await mkdtemp(path.join(os.tmpdir(), "benchside-upload-"));
  const dispose = () => rm(dir, { recursive: true, force: true });
  try {
    const found = await parse(body, contentType, dir, opts);
    if (!found) throw missing(opts);
    const { size } = await stat(found.path);
    if (size === 0) throw missing(opts);
    const blob = await openAsBlob(found.path, { type: found.type });
    return { file: new File([blob], found.name, { type: found.type }), bytes: size, dispose };
  } catch (error) {
    await dispose();
    throw error;
  }
}

function missing({ field, missingMessage = "Attach a file." }: ReceiveFileOptions) {
  return new AppError("invalid", `${missingMessage.replace(/\.$/, "")} (form field "${field}").`, { [field]: [missingMessage] });
}

type Found = { path: string; name: string; type: string };

function parse(body: ReadableStream<Uint8Array>, contentType: string, dir: string, opts: ReceiveFileOptions): Promise<Found | null> {
  return new Promise((resolve, reject) => {
    let parser: busboy.Busboy;
    try {
      parser = busboy({
        headers: { "content-type": contentType },
        // Small fields only; one file counts, and it may be one byte over the limit so we can tell.
        limits: { files: 1, fileSize: opts.maxFileBytes, fields: 20, fieldSize: 8 * 1024, parts: 40, headerPairs: 20 },
      });
    } catch {
      reject(new AppError("bad_request", CUT_OFF));
      return;
    }
    const source = Readable.fromWeb(body as import("node:stream/web").ReadableStream<Uint8Array>);
    let found: Found | null = null;
    let writing: Promise<void> | null = null;
    let fileStream: Readable | null = null;
    let failed = false;
    const fail = (error: unknown) => {
      if (failed) return;
      failed = true;
      source.unpipe(parser);
      // Stops pulling from the request body (cappedBody leaves the rest unread, then lets go).
      source.destroy();
      fileStream?.destroy();
      reject(error instanceof AppError ? error : new AppError("bad_request", CUT_OFF));
    };

    parser.on("file", (name, stream, info) => {
      if (name !== opts.field || found) {
        stream.resume();
        return;
      }
      const target = path.join(dir, "upload");
      found = { path: target, name: cleanName(info.filename), type: info.mimeType || "application/octet-stream" };
      fileStream = stream;
      stream.on("limit", () => fail(new AppError("too_large", opts.tooLargeMessage)));
      writing = pipeline(stream, createWriteStream(target)).catch((error: unknown) => fail(error));
    });
    parser.on("error", fail);
    parser.on("close", () => {
      if (failed) return;
      void (writing ?? Promise.resolve()).then(() => {
        if (!failed) resolve(found);
      });
    });
    source.on("error", fail);
    source.pipe(parser);
  });
}

/** The name as sent, reduced to printable characters (it is only ever shown, never a path). */
function cleanName(name: string | undefined): string {
  return (name ?? "").replace(/[\u0000-\u001f\u007f/\\]/g, "").trim().slice(0, 255);
}
