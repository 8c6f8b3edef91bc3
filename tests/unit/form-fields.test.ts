import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { WEEKDAYS } from "@/lib/shop-settings";

// Issue 16 §7: every form error appears beside the field that caused it, or in the form's banner
// as a message that says what to do. For each form schema listed in lib/schemas/form-fields.ts
// this walks the schema's error paths — a valid form, then each field in turn given each kind of
// text a browser can send — and fails when an error's path is no field the form shows or fills
// (a message nobody would see), or when its message is zod's stock wording ("Invalid input…"),
// which tells a person nothing. The forms pass the same `visible` list to useBenchForm, which puts
// messages for the other (hidden) fields in the banner.

const PUBLIC_ID = "AbCdEfGhIjKlMnOp";
/** A form each schema accepts, as the browser would post it. */
const VALID: Record<keyof typeof FORM_FIELDS, Record<string, string>> = {
  profileSettings: { shop: "cedar-flats", name: "Cedar Flats", email: "desk@cedar.test", phone: "+1 555 0100", address: "12 Mill Road" },
  hoursSettings: { shop: "cedar-flats", ...Object.fromEntries(WEEKDAYS.flatMap((d) => [[`${d}Open`, "08:00"], [`${d}Close`, "17:00"]])) },
  regionSettings: { shop: "cedar-flats", timezone: "America/Denver", currency: "USD" },
  labourSettings: { shop: "cedar-flats", defaultRate: "95.00", rateName0: "Diagnosis", rateAmount0: "120.00" },
  taxSettings: { shop: "cedar-flats", taxMethod: "per_line", taxRate: "8.25", partsTaxable: "on" },
  suppliesSettings: { shop: "cedar-flats", suppliesPercent: "5", suppliesBase: "labour", suppliesCap: "25.00" },
  toleranceSettings: { shop: "cedar-flats", toleranceKind: "custom", tolerancePercent: "10", toleranceFixed: "", toleranceCap: "" },
  digestSettings: { shop: "cedar-flats", digestWindowMinutes: "15" },
  benchSettings: { shop: "cedar-flats", torqueUnit: "nm", passes: "30, 60, 100", chainLimitPct: "3", clipMaxMinutes: "10", clipMaxGb: "2", ownerWaitDays: "3" },
  part: { job: PUBLIC_ID, description: "Clutch cable", partNumber: "", supplier: "", qty: "1", cost: "18.50", status: "needed", expectedOn: "2026-12-24", forWork: "booked" },
  partStatus: { job: PUBLIC_ID, part: "4", from: "needed", to: "ordered", expectedOn: "" },
  teardownStep: { job: PUBLIC_ID, removed: "Clutch cover", count: "9", size: "M6 × 30", notes: "", storage: "Tray A", photo: "" },
  stepTorque: { job: PUBLIC_ID, step: "4", torqueValue: "10", torqueUnit: "nm", boltCount: "9" },
  chainReading: { job: PUBLIC_ID, label: "", pitchMm: "15.875", pitches: "20", measuredMm: "320.1", limitPct: "", source: "" },
  addLine: { invoice: PUBLIC_ID, version: "3", kind: "labour", description: "Road test", hours: "0.5", rate: "", taxable: "on" },
  removeLine: { invoice: PUBLIC_ID, version: "3", line: "7" },
  draftDetails: { invoice: PUBLIC_ID, version: "3", discountKind: "none", discountValue: "", returnedPartsNote: "", note: "" },
  issue: { invoice: PUBLIC_ID, version: "3", confirmed: "yes" },
  void: { invoice: PUBLIC_ID, version: "3", reason: "Wrong job", confirmed: "yes" },
  recordPayment: { invoice: PUBLIC_ID, method: "cash", amount: "20.00", reference: "" },
  requestDeposit: { job: PUBLIC_ID, amount: "50.00", note: "", request: "" },
  customerContact: { shop: "cedar-flats", customer: "12", name: "Ilse Rowan", email: "ilse@mail.test", phone: "+1 555 0100", contactPreference: "text" },
  customerMerge: { shop: "cedar-flats", customer: "12", duplicate: "13", confirm: "yes" },
  dropoffPrepare: { chargeKind: "amount", chargeAmount: "95.00", chargeHours: "", description: "Inspection and diagnosis", authorisedUpTo: "300.00", terms: "" },
  dropoffSign: { shownHash: "0".repeat(64), signature: "Rowan Pike", wantsPartsBack: "", agree: "on" },
  shopSignup: { shopName: "Cedar Flats", slug: "cedar-flats", timezone: "America/Denver", currency: "USD", ownerName: "Ilse Rowan", email: "ilse@cedar.test", password: "gravel road at dusk" },
  confirmSignup: { token: "A".repeat(43), password: "gravel road at dusk" },
  bookingRequest: { shop: "cedar-flats", ticket: "A".repeat(40), name: "Ilse Rowan", email: "ilse@mail.test", phone: "", when: "", machine: "2017 trail bike", work: "Soft front brake", website: "" },
};

/** Text a field can hold when it reaches the server: empty, blank, huge, negative, words, odd numbers and times. */
const JUNK = ["", "   ", "x".repeat(5000), "-1", "abc", "0", "1.23456", "99:99", "on", "yes", "17:00", "08:00"];
/** zod's own messages ("Invalid input: expected …", "Too small: …") say nothing a person can act on. */
const STOCK = /^(Invalid|Too (small|big)|Expected|Required)\b/;

function keysOf(schema: z.ZodType): string[] {
  const s = schema as unknown as { shape?: Record<string, unknown>; def?: { in?: { shape?: Record<string, unknown> } } };
  return Object.keys(s.shape ?? s.def?.in?.shape ?? {});
}

function errorPaths(schema: z.ZodType, valid: Record<string, string>): { path: string; message: string; input: string }[] {
  const out: { path: string; message: string; input: string }[] = [];
  const fields = [...new Set([...keysOf(schema), ...Object.keys(valid)])];
  for (const field of fields) {
    for (const junk of JUNK) {
      const result = schema.safeParse({ ...valid, [field]: junk });
      for (const issue of result.error?.issues ?? []) out.push({ path: issue.path.join(".") || "_", message: issue.message, input: `${field}=${JSON.stringify(junk.slice(0, 12))}` });
    }
  }
  return out;
}

describe("form schemas: every error lands on a field the form shows, or in its banner", () => {
  for (const [name, entry] of Object.entries(FORM_FIELDS) as [keyof typeof FORM_FIELDS, (typeof FORM_FIELDS)[keyof typeof FORM_FIELDS]][]) {
    it(name, () => {
      const valid = VALID[name];
      expect(entry.schema.safeParse(valid).error?.issues ?? []).toEqual([]);
      const visible = new Set<string>(entry.visible);
      const banner = new Set<string>(entry.banner);
      expect([...visible].filter((f) => banner.has(f)), "a field is either shown or in the banner").toEqual([]);
      // Every key the schema reads is one the form renders or fills itself.
      expect(keysOf(entry.schema).filter((k) => !visible.has(k) && !banner.has(k))).toEqual([]);
      const errors = errorPaths(entry.schema, valid);
      // The walk reaches errors at all (a schema that accepts everything would prove nothing).
      expect(errors.length).toBeGreaterThan(0);
      expect(errors.filter((e) => !visible.has(e.path) && !banner.has(e.path)).map((e) => `${e.input} → ${e.path}: ${e.message}`)).toEqual([]);
      expect([...new Set(errors.filter((e) => STOCK.test(e.message)).map((e) => `${e.path}: ${e.message}`))]).toEqual([]);
    });
  }
});
