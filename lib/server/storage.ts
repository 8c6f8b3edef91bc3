import "server-only";
import { randomBytes } from "node:crypto";
import { createReadStream } from "node:fs";
import { mkdir, open, readFile, rename, rm, stat } from "node:fs/promises";
import path from "node:path";
import { Readable } from "node:stream";
import { DeleteObjectCommand, GetObjectCommand, NoSuchKey, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { AppError } from "@/lib/errors";

// One interface for uploads: local disk by default, S3-compatible object storage by configuration
// (see .env.example). Callers never build file paths; they pass keys such as "shops/7/photos/ab12/display.jpg".

export type StoredObject = { body: Buffer; contentType: string; size: number };
export type StoredStream = { stream: ReadableStream<Uint8Array>; contentType: string; size: number };

export interface ObjectStorage {
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  /** The whole object, or null when there is none under this key. */
  get(key: string): Promise<StoredObject | null>;
  /** The object as a web stream (for `new Response(stream)`), or null when there is none. */
  getStream(key: string): Promise<StoredStream | null>;
  /** Removes the object; removing a missing key is not an error. */
  delete(key: string): Promise<void>;
}

// Lower-case segments joined by single slashes, one extension: no "..", no absolute paths,
// no hidden files, nothing a filesystem or an S3 console would read differently.
const KEY_PATTERN = /^[a-z0-9][a-z0-9_-]*(?:\/[a-z0-9][a-z0-9_-]*)*\.[a-z0-9]+$/;
const MAX_KEY_LENGTH = 512;

export function assertValidKey(key: string): void {
  if (typeof key !== "string" || key.length > MAX_KEY_LENGTH || !KEY_PATTERN.test(key)) {
    throw new AppError("bad_request", "That file name isn't allowed in storage.");
  }
}

// The content type follows from the extension, so both drivers answer the same and local disk
// needs no side files; put() refuses a type that disagrees with the key.
const CONTENT_TYPES: Record<string, string> = {
  jpg: "image/jpeg",
  jpeg: "image/jpeg",
  png: "image/png",
  webp: "image/webp",
  gif: "image/gif",
  avif: "image/avif",
  pdf: "application/pdf",
  json: "application/json",
  txt: "text/plain",
  csv: "text/csv",
  mp4: "video/mp4",
  webm: "video/webm",
};

export function contentTypeForKey(key: string): string {
  const ext = key.slice(key.lastIndexOf(".") + 1);
  return CONTENT_TYPES[ext] ?? "application/octet-stream";
}

function checkPut(key: string, contentType: string): void {
  assertValidKey(key);
  const expected = contentTypeForKey(key);
  if (contentType !== expected) {
    throw new AppError("bad_request", `A .${key.split(".").pop()} file must be stored as ${expected}, not ${contentType}.`);
  }
}

const isMissing = (error: unknown) => {
  const code = (error as NodeJS.ErrnoException | null)?.code;
  return code === "ENOENT" || code === "ENOTDIR";
};

export class LocalDiskStorage implements ObjectStorage {
  readonly dir: string;

  constructor(dir: string) {
    this.dir = path.resolve(dir);
  }

  private pathFor(key: string): string {
    assertValidKey(key);
    const full = path.resolve(this.dir, key);
    // The pattern already rules out escapes; this guards against a future change to it.
    if (!full.startsWith(this.dir + path.sep)) throw new AppError("bad_request", "That file name isn't allowed in storage.");
    return full;
  }

  async put(key: string, body: Buffer, contentType: string): Promise<void> {
    checkPut(key, contentType);
    const target = this.pathFor(key);
    await mkdir(path.dirname(target), { recursive: true });
    // Write beside the target, flush, then rename: readers see the old file or the whole new one,
    // never a half-written photo. The ".tmp" name can't match a key (keys have one dot).
    const tmp = `${target}.${randomBytes(6).toString("hex")}.tmp`;
    try {
      const handle = await open(tmp, "wx");
      try {
        await handle.writeFile(body);
        await handle.sync();
      } finally {
        await handle.close();
      }
      await rename(tmp, target);
    } catch (error) {
      await rm(tmp, { force: true });
      throw error;
    }
  }

  async get(key: string): Promise<StoredObject | null> {
    const file = this.pathFor(key);
    try {
      const body = await readFile(file);
      return { body, contentType: contentTypeForKey(key), size: body.length };
    } catch (error) {
      if (isMissing(error)) return null;
      throw error;
    }
  }

  async getStream(key: string): Promise<StoredStream | null> {
    const file = this.pathFor(key);
    try {
      const info = await stat(file);
      if (!info.isFile()) return null;
      const stream = Readable.toWeb(createReadStream(file)) as unknown as ReadableStream<Uint8Array>;
      return { stream, contentType: contentTypeForKey(key), size: info.size };
    } catch (error) {
      if (isMissing(error)) return null;
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    await rm(this.pathFor(key), { force: true });
  }
}

export type S3StorageConfig = {
  bucket: string;
  region: string;
  endpoint?: string;
  forcePathStyle?: boolean;
  /** Both or neither; neither means the SDK's default chain (instance role, AWS_* variables). */
  accessKeyId?: string;
  secretAccessKey?: string;
};

const storageDown = () => new AppError("unavailable", "File storage isn't answering just now. Try again in a minute.");

export class S3Storage implements ObjectStorage {
  readonly bucket: string;
  private readonly client: S3Client;

  constructor(config: S3StorageConfig) {
    if (!config.bucket) throw new AppError("unavailable", "S3 storage is not configured (S3_BUCKET).");
    if (!config.region) throw new AppError("unavailable", "S3 storage is not configured (S3_REGION).");
    if (Boolean(config.accessKeyId) !== Boolean(config.secretAccessKey)) {
      const missing = config.accessKeyId ? "S3_SECRET_ACCESS_KEY" : "S3_ACCESS_KEY_ID";
      throw new AppError("unavailable", `S3 storage is not configured (${missing}): set both keys or neither.`);
    }
    this.bucket = config.bucket;
    this.client = new S3Client({
      region: config.region,
      ...(config.endpoint ? { endpoint: config.endpoint } : {}),
      forcePathStyle: config.forcePathStyle ?? false,
      ...(config.accessKeyId && config.secretAccessKey
        ? { credentials: { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey } }
        : {}),
    });
  }

  async put(key: string, body: Buffer, contentType: string): Promise<void> {
    checkPut(key, contentType);
    try {
      await this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentType: contentType }));
    } catch (error) {
      console.error("storage put failed:", key, (error as Error).name, (error as Error).message);
      throw storageDown();
    }
  }

  private async fetch(key: string) {
    assertValidKey(key);
    try {
      return await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
    } catch (error) {
      if (error instanceof NoSuchKey || (error as Error).name === "NoSuchKey") return null;
      console.error("storage get failed:", key, (error as Error).name, (error as Error).message);
      throw storageDown();
    }
  }

  async get(key: string): Promise<StoredObject | null> {
    const res = await this.fetch(key);
    if (!res?.Body) return null;
    const body = Buffer.from(await res.Body.transformToByteArray());
    return { body, contentType: res.ContentType ?? contentTypeForKey(key), size: body.length };
  }

  async getStream(key: string): Promise<StoredStream | null> {
    const res = await this.fetch(key);
    if (!res?.Body) return null;
    const stream = res.Body.transformToWebStream() as unknown as ReadableStream<Uint8Array>;
    return { stream, contentType: res.ContentType ?? contentTypeForKey(key), size: res.ContentLength ?? 0 };
  }

  async delete(key: string): Promise<void> {
    assertValidKey(key);
    try {
      await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
    } catch (error) {
      console.error("storage delete failed:", key, (error as Error).name, (error as Error).message);
      throw storageDown();
    }
  }
}

type Env = Record<string, string | undefined>;

/** Builds the storage the environment asks for; throws an AppError naming the variable to fix. */
export function storageFromEnv(env: Env = process.env): ObjectStorage {
  const driver = (env.STORAGE_DRIVER || "local").trim().toLowerCase();
  if (driver === "local") {
    // The dev server and `npm start` run from the project root, so this lands in the git-ignored .data.
    return new LocalDiskStorage(env.STORAGE_DIR || path.join(process.cwd(), ".data", "uploads"));
  }
  if (driver === "s3") {
    const pathStyle = (env.S3_FORCE_PATH_STYLE ?? "").trim().toLowerCase();
    if (pathStyle && !["true", "false", "1", "0"].includes(pathStyle)) {
      throw new AppError("unavailable", "S3 storage is not configured (S3_FORCE_PATH_STYLE must be true or false).");
    }
    return new S3Storage({
      bucket: env.S3_BUCKET?.trim() ?? "",
      region: env.S3_REGION?.trim() || "auto",
      endpoint: env.S3_ENDPOINT?.trim() || undefined,
      forcePathStyle: pathStyle === "true" || pathStyle === "1",
      accessKeyId: env.S3_ACCESS_KEY_ID?.trim() || undefined,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY?.trim() || undefined,
    });
  }
  throw new AppError("unavailable", `File storage is not configured (STORAGE_DRIVER must be "local" or "s3", not "${driver}").`);
}

let shared: ObjectStorage | undefined;

/** The app's storage, built once from the environment. */
export function storage(): ObjectStorage {
  shared ??= storageFromEnv();
  return shared;
}
