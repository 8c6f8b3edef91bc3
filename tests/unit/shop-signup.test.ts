import { describe, expect, it } from "vitest";
import { shopInitials } from "@/components/portfolio/story-placeholder";
import { shopSignupSchema } from "@/lib/schemas/shop-signup";
import { RESERVED_SLUGS, SLUG_RULE, suggestSlug } from "@/lib/shop-signup";

// The shop's address for links and what is drawn from its name (issue 16 §1, §6).
// Expected values: the rules as written in lib/schemas/shop-signup.ts (no published source).

describe("the shop's address for links", () => {
  it("suggests an address from the name: lowercase, accents dropped, runs of other characters one hyphen", () => {
    expect(suggestSlug("Kestrel Ridge Motor Works!")).toBe("kestrel-ridge-motor-works");
    expect(suggestSlug("  Señor Ñandú's  Sleds & Quads ")).toBe("senor-nandu-s-sleds-quads");
    expect(suggestSlug("---")).toBe("");
    expect(suggestSlug("x".repeat(50))).toHaveLength(40);
  });

  it("accepts letters, digits and single inner hyphens, 3 to 40 long", () => {
    for (const ok of ["abc", "kestrel-ridge", "a1-b2-c3", "x".repeat(40)]) expect(SLUG_RULE.test(ok), ok).toBe(true);
    for (const bad of ["ab", "-abc", "abc-", "a--b", "Abc", "a_b", "x".repeat(41), "ab c"]) expect(SLUG_RULE.test(bad), bad).toBe(false);
  });

  it("the schema refuses every reserved word", () => {
    for (const word of RESERVED_SLUGS) {
      const parsed = shopSignupSchema.shape.slug.safeParse(word);
      expect(parsed.success, word).toBe(false);
    }
  });
});

describe("the placeholder's initials", () => {
  it("takes the first letters of the first two words", () => {
    expect(shopInitials("Kestrel Ridge Motor Works")).toBe("KR");
    expect(shopInitials("saltmarsh small engine")).toBe("SS");
    expect(shopInitials("Ölund")).toBe("Ö");
    expect(shopInitials("!!!")).toBe("·");
  });
});
