import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { INBOX_KINDS } from "@/lib/shop-events";
import { WEEKDAYS } from "@/lib/shop-settings";

// Issue 16 §7: every form error appears beside the field that caused it, or in the form's banner
// as a message that says what to do. For each form schema listed in lib/schemas/form-fields.ts
// this walks the schema's error paths — a valid form, then each field in turn given each kind of
// text a browser can send — and fails when an error's path is no field the form shows or fills
// (a message nobody would see), or when its message is zod's stock wording ("Invalid input…"),
// which tells a person nothing. The forms pass the same `visible` list to useBenchForm, which puts
// messages for the other (hidden) fields in the banner.

const PUBLIC_ID = "AbCdEfGhIjKlMnOp";
const HASH = "0".repeat(64);
const TOKEN = "A".repeat(43);
/** A form each schema accepts, as the browser would post it (the findings pages post JSON, so numbers, lists and booleans there). */
const VALID: Record<keyof typeof FORM_FIELDS, Record<string, unknown>> = {
  profileSettings: { shop: "cedar-flats", name: "Cedar Flats", email: "desk@cedar.test", phone: "+1 555 0100", address: "12 Mill Road" },
  hoursSettings: { shop: "cedar-flats", ...Object.fromEntries(WEEKDAYS.flatMap((d) => [[`${d}Open`, "08:00"], [`${d}Close`, "17:00"]])) },
  regionSettings: { shop: "cedar-flats", timezone: "America/Denver", currency: "USD" },
  labourSettings: { shop: "cedar-flats", defaultRate: "95.00", rateName0: "Diagnosis", rateAmount0: "120.00" },
  taxSettings: { shop: "cedar-flats", taxMethod: "per_line", taxRate: "8.25", labourTaxRate: "", feeTaxRate: "5", suppliesTaxRate: "", partsTaxable: "on" },
  suppliesSettings: { shop: "cedar-flats", suppliesPercent: "5", suppliesBase: "labour", suppliesCap: "25.00" },
  markupSettings: { shop: "cedar-flats", markupKind: "bands", markupPercent: "", band1UpTo: "10.00", band1Percent: "100", band2UpTo: "50.00", band2Percent: "60", topPercent: "35" },
  toleranceSettings: { shop: "cedar-flats", toleranceKind: "custom", tolerancePercent: "10", toleranceFixed: "", toleranceCap: "" },
  digestSettings: { shop: "cedar-flats", digestWindowMinutes: "15" },
  dropoffSettings: { shop: "cedar-flats", dropoffCharge: "55.00", dropoffUpTo: "300.00" },
  benchSettings: { shop: "cedar-flats", torqueUnit: "nm", passes: "30, 60, 100", chainLimitPct: "3", clipMaxMinutes: "10", clipMaxGb: "2", ownerWaitDays: "3" },
  part: { job: PUBLIC_ID, description: "Clutch cable", partNumber: "", supplier: "", qty: "1", cost: "18.50", status: "needed", expectedOn: "2026-12-24", forWork: "booked" },
  partStatus: { job: PUBLIC_ID, part: "4", from: "needed", to: "ordered", expectedOn: "" },
  orderParts: { job: PUBLIC_ID, supplier: "Northgate Supply", reference: "PO-4411", orderedOn: "2026-12-01", expectedOn: "2026-12-03", parts: "4,5" },
  orderShopParts: { shop: "cedar-flats", supplier: "Northgate Supply", reference: "PO-4411", orderedOn: "2026-12-01", expectedOn: "2026-12-03", parts: "4,5" },
  backOrder: { job: PUBLIC_ID, part: "4", expectedOn: "2026-12-20" },
  movePart: { job: PUBLIC_ID, part: "4", toJob: "J-0042", thisJob: "swap" },
  coreCharge: { job: PUBLIC_ID, part: "4", charge: "25.00" },
  partDeposit: { job: PUBLIC_ID, part: "4", amount: "120.00", note: "" },
  teardownStep: { job: PUBLIC_ID, removed: "Clutch cover", count: "9", size: "M6 × 30", notes: "", storage: "Tray A", photo: "" },
  stepTorque: { job: PUBLIC_ID, step: "4", torqueValue: "10", torqueUnit: "nm", boltCount: "9" },
  teardownEdit: { job: PUBLIC_ID, step: "4", version: "2", removed: "Clutch cover", count: "9", size: "", notes: "Dowel at 12 o'clock", storage: "" },
  teardownDelete: { job: PUBLIC_ID, step: "4", version: "2" },
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
  passwordSignIn: { email: "desk@cedar.test", password: "gravel road at dusk" },
  ownerLink: { email: "ilse@mail.test", next: "/my/jobs" },
  linkSignIn: { token: TOKEN },
  passwordResetRequest: { email: "desk@cedar.test" },
  passwordReset: { token: TOKEN, password: "gravel road at dusk" },
  acceptInvite: { token: TOKEN, name: "Rowan Pike", password: "gravel road at dusk" },
  changePassword: { current: "gravel road at dusk", password: "tin roof in the rain" },
  inviteStaff: { shop: "cedar-flats", name: "Rowan Pike", email: "rowan@cedar.test", role: "technician" },
  staffRole: { shop: "cedar-flats", user: "12", role: "service_writer" },
  checkIn: {
    shop: "cedar-flats",
    customerMode: "new",
    customerName: "Ilse Rowan",
    customerEmail: "ilse@mail.test",
    customerPhone: "",
    machineKind: "dirt_bike",
    machineYear: "2017",
    machineMake: "Kestrel",
    machineModel: "TR 250",
    machineEngineCc: "249",
    machineSerial: "",
    machineHours: "312.4",
    machineOdometer: "6120",
    machineOdometerUnit: "km",
    concern: "Soft front brake",
    intakeNotes: "",
    promisedOn: "2026-12-24",
    technicianId: "",
  },
  statusChange: { job: PUBLIC_ID, from: "checked_in", to: "inspecting", note: "", override: "" },
  recordDeposit: { deposit: PUBLIC_ID, method: "cheque", reference: "1042" },
  refund: { job: PUBLIC_ID, payment: "9", amount: "20.00", reason: "", confirmed: "yes" },
  finding: {
    version: 2,
    title: "Front brake pads worn",
    found: "Pads at 1 mm",
    whyItMatters: "",
    safety: "brakes",
    evidence: [{ kind: "photo", ref: "ph_1", momentMs: null }],
    lines: [{ kind: "labour", description: "Fit new pads", hours: "0.5", rate: "" }],
  },
  recordDecision: {
    shownHash: HASH,
    lines: [{ no: 1, answer: "approved" }],
    method: "phone",
    personName: "Ilse Rowan",
    phoneCalled: "+1 555 0100",
    decidedAt: "2026-12-04T15:30:00Z",
    note: "",
    wantsPartsBack: false,
  },
  withdraw: { reason: "Parts no longer made" },
  answer: { shownHash: HASH, lines: [{ no: 1, answer: "declined" }], signature: "Ilse Rowan", wantsPartsBack: true, confirmed: true },
  inviteFollower: { job: PUBLIC_ID, email: "ana@mail.test" },
  askQuestion: { job: PUBLIC_ID, body: "Is the tensioner needed if I replace the chain?", request: PUBLIC_ID, line: "2" },
  answerQuestion: { job: PUBLIC_ID, question: "7", body: "Yes, we'd fit both." },
  frequency: { job: PUBLIC_ID, frequency: "daily" },
  textChoice: { job: PUBLIC_ID, channels: "both", phone: "+1 303 555 0142", consent: "yes" },
  textSettings: { shop: "cedar-flats", smsFrom: "+15550100777", quietStart: "21:00", quietEnd: "08:00", languageEs: "on", languageFr: "" },
  storyConsent: { job: PUBLIC_ID, decision: "given", shownHash: HASH, name: "Ilse Rowan" },
  storyCuration: { shop: "cedar-flats", story: "3", version: "2", title: "A trail bike's brakes", slug: "trail-bike-brakes", writeUp: "", cover: "", items: "[]" },
  shopProfile: { shop: "cedar-flats", displayName: "Cedar Flats", about: "", takesIn: "Dirt bikes", locationText: "", showLocation: "on", publicEmail: "desk@cedar.test", publicPhone: "", removeLogo: "" },
  inboxSettings: { shop: "cedar-flats", ...Object.fromEntries(INBOX_KINDS.map((k) => [k, "now"])) },
  spec: { shop: "cedar-flats", make: "Kestrel", model: "TR 250", kind: "torque", label: "Clutch cover bolts", value: "10", unit: "nm", min: "", max: "", boltCount: "9", notes: "", source: "" },
  torqueRecord: {
    job: PUBLIC_ID,
    fastener: "Clutch cover bolts",
    specValue: "10",
    unit: "nm",
    appliedValue: "10.2",
    wrenchClass: "type2_4",
    tolerancePct: "",
    passesDone: "on",
    checkPass: "",
    plausibleChecked: "",
    tool: "",
    passes: "30, 60, 100",
    boltCount: "9",
    note: "",
    share: "",
  },
  reading: { job: PUBLIC_ID, label: "Front disc thickness", value: "3.8", unit: "mm", min: "3.5", max: "", source: "" },
  measurementSet: {
    job: PUBLIC_ID,
    kind: "valve_clearance",
    unit: "mm",
    min: "0.10",
    max: "0.20",
    exhaustMin: "0.20",
    exhaustMax: "0.30",
    source: "Maker's manual p. 3-14",
    note: "",
    cyl0: "1",
    side0: "exhaust",
    label0: "left",
    value0: "0.12",
    shim0: "2.50",
  },
};

/** Text a field can hold when it reaches the server: empty, blank, huge, negative, words, odd numbers and times. */
const JUNK = ["", "   ", "x".repeat(5000), "-1", "abc", "0", "1.23456", "99:99", "on", "yes", "17:00", "08:00"];
/** zod's own messages ("Invalid input: expected …", "Too small: …") say nothing a person can act on. */
const STOCK = /^(Invalid|Too (small|big)|Expected|Required)\b/;

function keysOf(schema: z.ZodType): string[] {
  const s = schema as unknown as { shape?: Record<string, unknown>; def?: { in?: { shape?: Record<string, unknown> } } };
  return Object.keys(s.shape ?? s.def?.in?.shape ?? {});
}

function errorPaths(schema: z.ZodType, valid: Record<string, unknown>): { path: string; message: string; input: string }[] {
  const out: { path: string; message: string; input: string }[] = [];
  const fields = [...new Set([...keysOf(schema), ...Object.keys(valid)])];
  const record = (input: Record<string, unknown>, label: string) => {
    for (const issue of schema.safeParse(input).error?.issues ?? []) out.push({ path: issue.path.join(".") || "_", message: issue.message, input: label });
  };
  for (const field of fields) {
    for (const junk of JUNK) record({ ...valid, [field]: junk }, `${field}=${JSON.stringify(junk.slice(0, 12))}`);
    // Lists of objects (a finding's lines and evidence, an answer's lines): junk in each key of the
    // first item too, as JSON can carry it (numbers, null, booleans as well as text).
    const list = valid[field];
    if (!Array.isArray(list) || !list[0] || typeof list[0] !== "object") continue;
    for (const key of Object.keys(list[0] as object)) {
      for (const junk of [...JUNK, null, -1, 1.5, 1e12, true]) {
        record({ ...valid, [field]: [{ ...(list[0] as object), [key]: junk }, ...list.slice(1)] }, `${field}.0.${key}=${JSON.stringify(junk)?.slice(0, 12)}`);
      }
    }
  }
  return out;
}

/** Where a message shows: "lines.0.rate" beside line 1's rate, so by the list's own field name. */
const shownAt = (path: string) => (/\.\d+(\.|$)/.test(path) ? path.split(".")[0]! : path);

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
      expect(errors.filter((e) => !visible.has(shownAt(e.path)) && !banner.has(shownAt(e.path))).map((e) => `${e.input} → ${e.path}: ${e.message}`)).toEqual([]);
      expect([...new Set(errors.filter((e) => STOCK.test(e.message)).map((e) => `${e.path}: ${e.message}`))]).toEqual([]);
    });
  }
});
