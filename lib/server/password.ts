import bcrypt from "bcryptjs";

// bcrypt is adaptive: raise the cost as hardware gets faster. 12 ≈ a quarter second here.
const COST = 12;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

export function verifyPassword(plain: string, hash: string): Promise<boolean> {
  return bcrypt.compare(plain, hash);
}

let decoy: Promise<string> | undefined;

/** A hash to compare against when the e-mail is unknown, so both paths take about the same time. */
export function timingDecoyHash(): Promise<string> {
  decoy ??= bcrypt.hash("no account has this password", COST);
  return decoy;
}
