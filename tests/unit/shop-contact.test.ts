import { describe, expect, it } from "vitest";
import { telHref } from "@/lib/shop-contact";

describe("telHref", () => {
  it("dials the digits, keeping an international prefix", () => {
    // RFC 3966 §5.1.4: a global number starts with "+", separators are only visual.
    expect(telHref("+1 (555) 010-0142")).toBe("tel:+15550100142");
    expect(telHref("555.010.0142")).toBe("tel:5550100142");
    expect(telHref(" 0161 496 0000 ")).toBe("tel:01614960000");
  });

  it("gives no link for nothing to dial", () => {
    expect(telHref(null)).toBeNull();
    expect(telHref("")).toBeNull();
    expect(telHref("call us")).toBeNull();
    // ITU-T E.164 §6: at most 15 digits.
    expect(telHref("+1234567890123456")).toBeNull();
  });
});
