import "server-only";
import crypto from "node:crypto";
import { type RequestSnapshot, canonicalJson } from "@/lib/approvals";

/** SHA-256 of UTF-8 text, lower-case hex (FIPS 180-4). */
export function sha256Hex(text: string): string {
  return crypto.createHash("sha256").update(text, "utf8").digest("hex");
}

/** The canonical text of a snapshot and its hash: what a decision proves was shown. */
export function sealSnapshot(snapshot: RequestSnapshot): { canonical: string; hash: string } {
  const canonical = canonicalJson(snapshot);
  return { canonical, hash: sha256Hex(canonical) };
}

/**
 * Whether a stored request is still exactly what was sealed: the canonical text hashes to the
 * stored hash, and the stored snapshot still canonicalises to that text.
 */
export function sealIntact(r: { snapshot: RequestSnapshot; canonical: string; hash: string }): boolean {
  return sha256Hex(r.canonical) === r.hash && canonicalJson(r.snapshot) === r.canonical;
}

/**
 * A token for the request e-mail's image links. 32 random bytes, so a plain SHA-256 is enough
 * to store it (nothing to guess); the raw token exists only in the e-mail.
 */
export function newMailToken(): { token: string; tokenHash: string } {
  const token = crypto.randomBytes(32).toString("base64url");
  return { token, tokenHash: sha256Hex(token) };
}
