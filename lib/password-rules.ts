// What a new password must be, after NIST SP 800-63B §5.1.1.2 (memorized secrets chosen by the
// subscriber): at least 8 characters, at least 64 allowed (here 100), every Unicode character
// welcome and counted as one, never truncated; checked against commonly used or breached
// passwords, repetitive or sequential characters and context-specific words (the service's
// name, the person's name or address); no composition rules (no "one digit, one capital").
// Pure: the common-password list is handed in (lib/server/password.ts loads it).

export const PASSWORD_MIN_LENGTH = 8;
export const PASSWORD_MAX_LENGTH = 100;

export type PasswordProblem = "too-short" | "too-long" | "common" | "pattern" | "personal";

// §5.1.1.2: when a password is refused, say why, so the person can choose another.
export const PASSWORD_PROBLEMS: Record<PasswordProblem, string> = {
  "too-short": `Use at least ${PASSWORD_MIN_LENGTH} characters. A few ordinary words in a row make a long password that is easy to remember.`,
  "too-long": `Use at most ${PASSWORD_MAX_LENGTH} characters.`,
  common: "That password is on a list of commonly used and leaked passwords that attackers try first. Choose a different one.",
  pattern: "A run of one repeated character, or of consecutive letters or digits, is easy to guess. Choose a different password.",
  personal: "Don't build your password from your name, your e-mail address or the name of this service. Choose a different one.",
};

/** How passwords are compared and stored: NFKC, as §5.1.1.2 recommends before hashing. */
export function normalizePassword(password: string): string {
  return password.normalize("NFKC");
}

/** Code points, not UTF-16 units: §5.1.1.2 counts each Unicode character as one. */
export const passwordLength = (password: string) => [...normalizePassword(password)].length;

/** "aaaaaaaa", "12345678", "abcdefgh", "87654321": one character repeated, or a straight run up or down. */
export function isRunOfCharacters(password: string): boolean {
  const codes = [...password.toLowerCase()].map((c) => c.codePointAt(0)!);
  if (codes.length < 2) return false;
  const step = codes[1]! - codes[0]!;
  if (Math.abs(step) > 1) return false;
  return codes.every((c, i) => i === 0 || c - codes[i - 1]! === step);
}

const lettersOnly = (s: string) => s.toLowerCase().replace(/[^\p{L}]/gu, "");

/** Context-specific words: the password is one of them with only digits or symbols around it. */
function isPersonal(password: string, context: readonly string[]): boolean {
  const core = lettersOnly(password);
  if (!core) return false;
  const words = context.flatMap((c) => {
    const lower = c.toLowerCase();
    // An address counts as a whole and by its local part; a name as a whole and word by word.
    const parts = [lower, lower.split("@")[0] ?? "", ...lower.split(/[\s@._+-]+/)];
    return parts.map(lettersOnly).filter((w) => w.length >= 4);
  });
  return words.includes(core);
}

/**
 * The first rule the password breaks, or null when it may be used. `isCommon` gets the
 * password normalised and lower-cased; `context` is the service's and the person's words.
 */
export function passwordProblem(password: string, opts: { isCommon: (normalisedLower: string) => boolean; context: readonly string[] }): PasswordProblem | null {
  const length = passwordLength(password);
  if (length < PASSWORD_MIN_LENGTH) return "too-short";
  if (length > PASSWORD_MAX_LENGTH) return "too-long";
  const lower = normalizePassword(password).toLowerCase();
  if (opts.isCommon(lower) || opts.isCommon(lower.trim())) return "common";
  if (isRunOfCharacters(lower)) return "pattern";
  if (isPersonal(lower, ["Benchside", ...opts.context])) return "personal";
  return null;
}
