import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { PASSWORD_MAX_LENGTH, PASSWORD_PROBLEMS, isRunOfCharacters, passwordLength, passwordProblem } from "@/lib/password-rules";

// The shipped list (its header names the source), read as lib/server/password.ts reads it.
const LIST = new Set(
  fs
    .readFileSync(path.join(__dirname, "../../lib/data/common-passwords.txt"), "utf8")
    .split("\n")
    .filter((l) => l && !l.startsWith("#")),
);
const check = (password: string, context: string[] = []) => passwordProblem(password, { isCommon: (p) => LIST.has(p), context });

describe("password rules (NIST SP 800-63B §5.1.1.2, memorized secrets)", () => {
  it("refuses fewer than 8 characters", () => {
    // §5.1.1.2: "at least 8 characters in length if chosen by the subscriber".
    expect(check("k7#Qz!p")).toBe("too-short");
    expect(check("k7#Qz!pw")).toBeNull();
  });

  it("allows at least 64 characters, and here up to 100", () => {
    // §5.1.1.2: verifiers "SHOULD permit subscriber-chosen memorized secrets at least 64 characters in length".
    expect(check("gravel road at dusk with a smoking two-stroke and no spare plug!!".padEnd(64, "x"))).toBeNull();
    expect(check("a quiet lathe ".repeat(7).slice(0, PASSWORD_MAX_LENGTH))).toBeNull();
    expect(check("a quiet lathe ".repeat(8))).toBe("too-long");
  });

  it("counts each Unicode character as one, after NFKC normalisation", () => {
    // §5.1.1.2: "each Unicode code point SHALL be counted as a single character"; normalise with NFKC or NFKD.
    expect(passwordLength("🔧🔩⚙️🛵🏍️🪛🧰🛞")).toBe(10); // ⚙️ and 🏍️ carry a variation selector each
    expect(passwordLength("ﬁﬁﬁﬁ")).toBe(8); // the "fi" ligature becomes "f" + "i" under NFKC
    expect(check("ключ от гаража")).toBeNull();
    expect(check("🔧🔩🛵🪛🧰🛞🔧🔩")).toBeNull();
  });

  it("refuses commonly used and breached passwords, whatever their case", () => {
    // §5.1.1.2: compare against "passwords obtained from previous breach corpuses" and "dictionary words".
    for (const p of ["password", "12345678", "iloveyou", "PASSWORD", "Sunshine1", "qwertyuiop"]) expect(check(p), p).toBe("common");
    expect(PASSWORD_PROBLEMS.common).toMatch(/commonly used/);
  });

  it("refuses repetitive or sequential characters", () => {
    // §5.1.1.2: "Repetitive or sequential characters (e.g. 'aaaaaa', '1234abcd')".
    expect(isRunOfCharacters("zzzzzzzzzz")).toBe(true);
    expect(isRunOfCharacters("lmnopqrstu")).toBe(true);
    expect(isRunOfCharacters("9876543210")).toBe(true);
    expect(isRunOfCharacters("lmnopqrsu")).toBe(false);
    expect(check("zzzzzzzzzzzzz")).toBe("pattern");
  });

  it("refuses context-specific words: the service's name, the person's name and address", () => {
    // §5.1.1.2: "Context-specific words, such as the name of the service, the username, and derivatives thereof".
    expect(check("Benchside2026")).toBe("personal");
    expect(check("marguerite.okafor", ["marguerite.okafor@shop.test"])).toBe("personal");
    expect(check("Okafor!!!!", ["Marguerite Okafor"])).toBe("personal");
    expect(check("okafor rebuilt the carb", ["Marguerite Okafor"])).toBeNull();
  });

  it("has no composition rules: lower-case words alone are fine", () => {
    // §5.1.1.2: verifiers "SHOULD NOT impose other composition rules (e.g., requiring mixtures of different character types)".
    expect(check("torque the head bolts in order")).toBeNull();
    expect(check("correct horse battery staple")).toBeNull();
  });

  it("says why a password was refused", () => {
    // §5.1.1.2: when a secret is refused, "the verifier SHALL advise the subscriber … the reason for rejection".
    for (const message of Object.values(PASSWORD_PROBLEMS)) expect(message.length).toBeGreaterThan(20);
    expect(PASSWORD_PROBLEMS["too-short"]).toMatch(/at least 8 characters/);
  });
});
