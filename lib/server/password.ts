import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import bcrypt from "bcryptjs";
import { AppError } from "@/lib/errors";
import { PASSWORD_PROBLEMS, normalizePassword, passwordProblem } from "@/lib/password-rules";

// bcrypt is adaptive: raise the cost as hardware gets faster. 12 ≈ a quarter second here.
const COST = 12;

/**
 * What bcrypt is given: the password NFKC-normalised (NIST SP 800-63B §5.1.1.2), and, when that
 * is over bcrypt's 72 bytes (which it would silently cut), its SHA-256 instead, so a long
 * password counts whole and is never truncated. Passwords of up to 72 bytes hash as before.
 */
function bcryptInput(plain: string): string {
  const normal = normalizePassword(plain);
  if (Buffer.byteLength(normal, "utf8") <= 72) return normal;
  return `sha256:${crypto.createHash("sha256").update(normal, "utf8").digest("base64")}`;
}

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(bcryptInput(plain), COST);
}

export function verifyPassword(plain: string, hash: string): Promise<boolean> {
  return bcrypt.compare(bcryptInput(plain), hash);
}

let decoy: Promise<string> | undefined;

/** A hash to compare against when the e-mail is unknown, so both paths take about the same time. */
export function timingDecoyHash(): Promise<string> {
  decoy ??= bcrypt.hash("no account has this password", COST);
  return decoy;
}

let common: Set<string> | undefined;

/** lib/data/common-passwords.txt (its header names the source), read once. */
export function commonPasswords(): Set<string> {
  if (!common) {
    const text = fs.readFileSync(path.join(process.cwd(), "lib", "data", "common-passwords.txt"), "utf8");
    common = new Set(text.split("\n").filter((line) => line && !line.startsWith("#")));
  }
  return common;
}

/**
 * Refuses a new password that breaks the rules of lib/password-rules.ts with a 422 whose message
 * sits beside `field`. `context`: the person's name and address (never allowed as a password).
 */
export function assertUsablePassword(password: string, context: readonly string[], field = "password"): void {
  const set = commonPasswords();
  const problem = passwordProblem(password, { isCommon: (p) => set.has(p), context });
  if (problem) throw new AppError("invalid", PASSWORD_PROBLEMS[problem], { [field]: [PASSWORD_PROBLEMS[problem]] });
}
