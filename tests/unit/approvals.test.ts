import { describe, expect, it } from "vitest";
import { buildOverview } from "@/lib/approvals-overview";
import { DEFAULT_MONEY_SETTINGS, type DraftLine, type RequestSnapshot, buildSnapshot, canonicalJson, checkAnswers, decisionTotals, snapshotContent } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import { sealIntact, sealSnapshot, sha256Hex } from "@/lib/server/approval-hash";
import { readLines } from "@/lib/server/findings";

const part = (description: string, unitPriceMinor: number | null, taxable = true): DraftLine => ({
  kind: "part",
  description,
  partNumber: null,
  qtyThousandths: 1000,
  unitPriceMinor,
  hoursTenths: null,
  rateMinor: null,
  amountMinor: null,
  taxable,
});
// REFERENCES §5 worked example: $19.99, $42.50, $6.99 at 8.25 %.
const example = [part("Pads", 1999), part("Rotor", 4250), part("Fluid", 699)];

function snapshot(method: "per_line" | "per_invoice", lines = example): RequestSnapshot {
  return buildSnapshot({
    request: "req0000000000001",
    job: "job0000000000001",
    version: 1,
    currency: "usd",
    finding: { title: "Front brakes", found: "Pads at 1 mm.", whyItMatters: null, safety: "brakes" },
    evidence: [{ kind: "photo", ref: "p".repeat(22), momentMs: null, label: null }],
    lines,
    pricing: { tax: { ratePercent: "8.25", method }, supplies: null },
  });
}

describe("canonical JSON", () => {
  it("sorts members by UTF-16 code units", () => {
    const value = { "\u20ac": "Euro Sign", "\r": "Carriage Return", "\ufb33": "Hebrew Letter Dalet With Dagesh", "1": "One", "\ud83d\ude00": "Emoji: Grinning Face", "\u0080": "Control", "\u00f6": "Latin Small Letter O With Diaeresis" };
    // (Read as text: a parsed object would move the integer-like key "1" to the front.)
    const order = ["\r", "1", "\u0080", "\u00f6", "\u20ac", "\ud83d\ude00", "\ufb33"];
    // RFC 8785 §3.2.3, property sorting example
    expect(canonicalJson(value)).toBe(`{${order.map((k) => `${JSON.stringify(k)}:${JSON.stringify(value[k as keyof typeof value])}`).join(",")}}`);
  });

  it("writes no whitespace, sorts nested objects, keeps array order and drops undefined members", () => {
    // RFC 8785 §3.2.1 (no whitespace) and §3.2.3 (recursive sorting); arrays keep their order
    expect(canonicalJson({ z: { b: [3, 1, { d: null, c: true }], a: "x" }, a: -0, u: undefined })).toBe('{"a":0,"z":{"a":"x","b":[3,1,{"c":true,"d":null}]}}');
  });

  it("refuses numbers that aren't safe integers, so two writers can't format one differently", () => {
    expect(() => canonicalJson({ rate: 8.25 })).toThrow(AppError);
    expect(() => canonicalJson({ big: 2 ** 53 })).toThrow(/whole numbers/);
  });
});

describe("SHA-256 of the canonical text", () => {
  it('hashes "abc" to the published digest', () => {
    // FIPS 180-2, Appendix B.1 (SHA-256 example "abc")
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("a sealed snapshot stays intact until any byte of it changes", () => {
    const s = snapshot("per_line");
    const sealed = sealSnapshot(s);
    expect(sealed.hash).toBe(sha256Hex(sealed.canonical));
    expect(sealIntact({ snapshot: s, ...sealed })).toBe(true);
    expect(sealIntact({ snapshot: s, canonical: sealed.canonical.replace("1999", "1899"), hash: sealed.hash })).toBe(false);
    const edited = { ...s, lines: s.lines.map((l, i) => (i ? l : { ...l, netMinor: 1 })) };
    expect(sealIntact({ snapshot: edited, ...sealed })).toBe(false);
  });
});

describe("request snapshot", () => {
  it("prices the lines with the shop's tax method: per line $5.74, per invoice $5.73", () => {
    const perLine = snapshot("per_line");
    expect(perLine.lines.map((l) => l.taxMinor)).toEqual([165, 351, 58]); // SSUTA §324 / RCW 82.08.054, REFERENCES §5 (per item)
    expect(perLine.totals.taxMinor).toBe(574); // SSUTA §324 / RCW 82.08.054, REFERENCES §5
    expect(perLine.totals.totalMinor).toBe(7522); // 69.48 + 5.74, REFERENCES §5
    expect(snapshot("per_invoice").totals.taxMinor).toBe(573); // SSUTA §324 / RCW 82.08.054, REFERENCES §5 (per invoice)
    expect(perLine.currency).toBe("USD");
  });

  it("says which line still needs a price, and needs at least one line", () => {
    expect(() => snapshot("per_line", [part("Pads", 1999), part("Rotor", null)])).toThrow(/Line 2 \(Rotor\) has no unit price yet/);
    expect(() => snapshot("per_line", [])).toThrow(/at least one line/);
  });

  it("content is equal for the same finding sent again under another id and version", () => {
    const a = snapshot("per_line");
    expect(snapshotContent({ ...a, request: "other0000000001", version: 2 })).toBe(snapshotContent(a));
    expect(snapshotContent(snapshot("per_invoice"))).not.toBe(snapshotContent(a));
  });
});

describe("answers and decision totals", () => {
  const s = snapshot("per_line");

  it("needs every line answered once, approved or declined", () => {
    expect(checkAnswers(s, [{ no: 1, answer: "approved" }, { no: 2, answer: "declined" }, { no: 3, answer: "approved" }])).toEqual({ 1: "approved", 2: "declined", 3: "approved" });
    const missing = (() => {
      try {
        checkAnswers(s, [{ no: 1, answer: "approved" }, { no: 1, answer: "declined" }, { no: 9, answer: "approved" }]);
      } catch (e) {
        return e as AppError;
      }
    })();
    expect(missing?.fields).toMatchObject({ "lines.1": ["This line was answered twice."], "lines.9": ["This request has no such line."], "lines.2": [expect.stringContaining("Rotor")] });
  });

  it("authorises only approved lines, taxed again on their own; unanswered lines authorise nothing", () => {
    const t = decisionTotals(s, { 1: "approved", 2: "declined", 3: "approved" });
    expect(t.authorised.preTaxTotalMinor).toBe(1999 + 699);
    expect(t.authorised.taxMinor).toBe(165 + 58); // SSUTA §324 / RCW 82.08.054 per line, REFERENCES §5
    expect(t.estimate.totalMinor).toBe(7522); // REFERENCES §5
    expect(t.declinedPreTaxMinor).toBe(4250);
    expect(decisionTotals(s, { 1: "approved" })).toMatchObject({ approvedCount: 1, declinedCount: 0, authorised: { preTaxTotalMinor: 1999 } });
  });
});

describe("overview warnings against what is authorised", () => {
  const request = (preTax: number) => ({
    publicId: "r1",
    findingId: 1,
    version: 1,
    status: "answered" as const,
    sentAt: "2026-01-01T00:00:00.000Z",
    sentTo: null,
    sentBy: null,
    openedAt: null,
    answeredAt: null,
    withdrawnAt: null,
    replacedBy: null,
    estimatePreTaxMinor: preTax,
    estimateTotalMinor: preTax,
  });
  const decisions = (preTax: number) =>
    new Map([["r1", { method: "online" as const, personName: "A", decidedAt: "", approved: 1, declined: 0, wantsPartsBack: false, authorisedPreTaxMinor: preTax, authorisedTotalMinor: preTax, lines: [{ no: 1, answer: "approved" as const, kind: "fee" as const, description: "Work", netMinor: preTax }] }]]);
  const finding = (id: number, lines: DraftLine[]) => ({ id, title: `F${id}`, safety: "none" as const, version: 1, createdBy: null, updatedAt: "2026-01-02T00:00:00.000Z", lines });
  const fee = (amountMinor: number): DraftLine => ({ ...part("x", null, false), kind: "fee", qtyThousandths: null, unitPriceMinor: null, amountMinor });
  const florida = { ...DEFAULT_MONEY_SETTINGS, tolerance: { kind: "greater_of" as const, fixedMinor: 1000, percent: "10", capMinor: 5000 } };

  it("strict (the default): any unauthorised priced work warns", () => {
    const o = buildOverview({ currency: "USD", settings: DEFAULT_MONEY_SETTINGS, findings: [finding(1, [fee(30000)]), finding(2, [fee(1)])], requests: [request(30000)], decisions: decisions(30000) });
    expect(o.findings[0]!.state).toBe("answered");
    expect(o.warnings.map((w) => w.findingId)).toEqual([2]);
    expect(o.authorised.preTaxMinor).toBe(30000);
  });

  it("greater of $10 or 10 %, capped at $50: on $300 authorised, $30 more is allowed and $30.01 is not", () => {
    const within = buildOverview({ currency: "USD", settings: florida, findings: [finding(2, [fee(3000)])], requests: [request(30000)], decisions: decisions(30000) });
    expect(within.warnings).toEqual([]); // Florida §559.909: E = $300 → $30 (REFERENCES §6)
    const over = buildOverview({ currency: "USD", settings: florida, findings: [finding(2, [fee(3001)])], requests: [request(30000)], decisions: decisions(30000) });
    expect(over.warnings[0]!.message).toContain("tolerance of $30.00"); // Florida §559.909, REFERENCES §6
  });

  it("unpriced drafts say what is missing instead of a total", () => {
    const o = buildOverview({ currency: "USD", settings: DEFAULT_MONEY_SETTINGS, findings: [finding(3, [part("Pads", null)])], requests: [], decisions: new Map() });
    expect(o.findings[0]!.draft).toEqual({ missing: expect.stringContaining("no unit price yet") });
    expect(o.warnings).toEqual([]);
  });
});

describe("reading typed lines", () => {
  const settings = { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 11500 };

  it("reads quantities, hours and prices exactly; a new labour line starts at the shop's rate", () => {
    const lines = readLines(
      [
        { kind: "part", description: "Oil", partNumber: null, qty: "1.5", unitPrice: "12.40" },
        { kind: "labour", description: "Fit", partNumber: null, hours: "1.5" },
      ],
      [],
      { currency: "USD", mayPrice: true, settings },
    );
    expect(lines[0]).toMatchObject({ qtyThousandths: 1500, unitPriceMinor: 1240, taxable: true });
    expect(lines[1]).toMatchObject({ hoursTenths: 15, rateMinor: 11500, taxable: false });
  });

  it("pins a bad value to its field and keeps prices out of a technician's hands", () => {
    expect(() => readLines([{ kind: "labour", description: "Fit", partNumber: null, hours: "1.25" }], [], { currency: "USD", mayPrice: true, settings })).toThrow(
      expect.objectContaining({ fields: { "lines.0.hours": [expect.stringContaining("at most 1 decimal place")] } }),
    );
    expect(() => readLines([{ kind: "fee", description: "Disposal", partNumber: null, amount: "5" }], [], { currency: "USD", mayPrice: false, settings })).toThrow(
      expect.objectContaining({ code: "forbidden" }),
    );
  });
});
