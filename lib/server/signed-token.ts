import "server-only";
import crypto from "node:crypto";

// Opaque tokens for links in e-mails that must work without signing in (one-click unsubscribe,
// photo thumbnails): version, purpose and payload, then an HMAC-SHA256 (cut to 128 bits) keyed
// from AUTH_SECRET, all base64url. A token made for one purpose never passes for another, and
// changing any byte fails the check.

const VERSION = 1;
const PURPOSE = { unsubscribe: 1, "mail-thumb": 2, "booking-form": 3 } as const;
type Purpose = keyof typeof PURPOSE;
const MAC_BYTES = 16;

function key(): Buffer {
  const secret = process.env.AUTH_SECRET;
  if (!secret) throw new Error("AUTH_SECRET is not set; `npm start` sets it, or see .env.example.");
  // A key of its own, so these MACs can never be confused with anything else signed with AUTH_SECRET.
  return crypto.createHmac("sha256", secret).update("benchside e-mail link tokens").digest();
}

const mac = (head: Buffer) => crypto.createHmac("sha256", key()).update(head).digest().subarray(0, MAC_BYTES);

export function signToken(purpose: Purpose, payload: Buffer): string {
  const head = Buffer.concat([Buffer.from([VERSION, PURPOSE[purpose]]), payload]);
  return Buffer.concat([head, mac(head)]).toString("base64url");
}

/** The payload of a genuine token for this purpose, or null for anything else. */
export function verifyToken(purpose: Purpose, token: string): Buffer | null {
  if (typeof token !== "string" || !/^[A-Za-z0-9_-]{24,200}$/.test(token)) return null;
  const raw = Buffer.from(token, "base64url");
  // Only the one canonical spelling of the bytes counts (base64 can hide spare bits in the last character).
  if (raw.toString("base64url") !== token || raw.length < 2 + MAC_BYTES) return null;
  const head = raw.subarray(0, raw.length - MAC_BYTES);
  if (!crypto.timingSafeEqual(raw.subarray(raw.length - MAC_BYTES), mac(head))) return null;
  if (head[0] !== VERSION || head[1] !== PURPOSE[purpose]) return null;
  return head.subarray(2);
}

export function unsubscribeToken(subscriberId: number): string {
  const payload = Buffer.alloc(8);
  payload.writeBigUInt64BE(BigInt(subscriberId));
  return signToken("unsubscribe", payload);
}

export function readUnsubscribeToken(token: string): number | null {
  const payload = verifyToken("unsubscribe", token);
  if (!payload || payload.length !== 8) return null;
  const id = Number(payload.readBigUInt64BE());
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}

/** A thumbnail address for e-mail: mail clients fetch images without our cookies, so the link carries its own right, for a while. */
export function mailThumbToken(photoPublicId: string, expiresAt: Date): string {
  const payload = Buffer.alloc(4);
  payload.writeUInt32BE(Math.floor(expiresAt.getTime() / 1000));
  return signToken("mail-thumb", Buffer.concat([payload, Buffer.from(photoPublicId, "latin1")]));
}

export function readMailThumbToken(token: string, now = new Date()): string | null {
  const payload = verifyToken("mail-thumb", token);
  if (!payload || payload.length < 5) return null;
  if (payload.readUInt32BE(0) * 1000 < now.getTime()) return null;
  return payload.subarray(4).toString("latin1");
}

/** The booking form's ticket: which shop's page made it and when, so a post that comes too soon after the page was rendered is told to wait. */
export function bookingTicket(shopId: number, issuedAt = new Date()): string {
  const payload = Buffer.alloc(12);
  payload.writeUInt32BE(shopId, 0);
  payload.writeBigUInt64BE(BigInt(issuedAt.getTime()), 4);
  return signToken("booking-form", payload);
}

export function readBookingTicket(token: string): { shopId: number; issuedAt: number } | null {
  const payload = verifyToken("booking-form", token);
  if (!payload || payload.length !== 12) return null;
  return { shopId: payload.readUInt32BE(0), issuedAt: Number(payload.readBigUInt64BE(4)) };
}

/** A sign-in, invite or reset token as stored: its SHA-256 with the app's secret, so a database copy can't be used to sign in. */
export function hashToken(token: string): string {
  return crypto.createHash("sha256").update(`${token}${process.env.AUTH_SECRET ?? ""}`).digest("hex");
}
