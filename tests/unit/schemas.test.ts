import { describe, expect, it } from "vitest";
import { linkRequestSchema, linkTokenSchema, passwordSignInSchema } from "@/lib/schemas/auth";
import { formatJobNumber, jobListQuerySchema, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { daysOverdue, isOverdue, jobAttention, overdueLabel, shopToday } from "@/lib/jobs-view";
import { LATEST_MODEL_YEAR, checkInFormSchema, checkInSchema, customerSearchQuerySchema, promisedOnProblem } from "@/lib/schemas/check-in";

describe("job list query", () => {
  it("fills defaults for an empty query", () => {
    expect(jobListQuerySchema.parse({})).toEqual({ q: "", status: [], attention: [], sort: "updated", dir: "desc", page: 1, pageSize: 25 });
  });

  it("reads comma-separated and repeated statuses, without duplicates", () => {
    expect(jobListQuerySchema.parse({ status: "ready,waiting_parts,ready" }).status).toEqual(["ready", "waiting_parts"]);
    expect(jobListQuerySchema.parse({ status: ["ready", "picked_up"] }).status).toEqual(["ready", "picked_up"]);
  });

  it("refuses unknown statuses, sorts, page sizes and pages, naming the field", () => {
    const bad = jobListQuerySchema.safeParse({ status: "ready,lost", sort: "colour", pageSize: "33", page: "0" });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["status", "sort", "pageSize", "page"]));
    expect(bad.error!.issues.find((i) => i.path[0] === "status")!.message).toBe("Unknown status: lost");
  });

  it("reads the quick filters like statuses and names an unknown one", () => {
    expect(jobListQuerySchema.parse({ attention: "overdue,waiting_parts,overdue" }).attention).toEqual(["overdue", "waiting_parts"]);
    expect(jobListQuerySchema.parse({ attention: ["waiting_parts"] }).attention).toEqual(["waiting_parts"]);
    const bad = jobListQuerySchema.safeParse({ attention: "overdue,late" });
    expect(bad.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([["attention", "Unknown quick filter: late"]]);
  });

  it("trims the search and caps its length", () => {
    expect(jobListQuerySchema.parse({ q: "  Calloway " }).q).toBe("Calloway");
    expect(jobListQuerySchema.safeParse({ q: "x".repeat(101) }).success).toBe(false);
  });
});

describe("job numbers", () => {
  it("accepts the ways people write them", () => {
    expect(jobNumberParamSchema.parse("J-0042")).toBe(42);
    expect(jobNumberParamSchema.parse("j42")).toBe(42);
    expect(jobNumberParamSchema.parse("7")).toBe(7);
    expect(jobNumberParamSchema.safeParse("42; DROP TABLE jobs").success).toBe(false);
    expect(jobNumberParamSchema.safeParse("").success).toBe(false);
  });

  it("formats with at least four digits", () => {
    expect(formatJobNumber(42)).toBe("J-0042");
    expect(formatJobNumber(12345)).toBe("J-12345");
  });
});

describe("sign-in inputs", () => {
  it("normalises the e-mail address", () => {
    expect(passwordSignInSchema.parse({ email: "  Dana@CopperGulch.TEST ", password: "x" }).email).toBe("dana@coppergulch.test");
  });

  it("explains a bad address and a missing password", () => {
    const r = passwordSignInSchema.safeParse({ email: "not-an-address", password: "" });
    expect(r.success).toBe(false);
    const messages = Object.fromEntries(r.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(messages).toEqual({ email: "That doesn't look like an e-mail address", password: "Enter your password" });
  });

  it("accepts only same-site return paths", () => {
    expect(linkRequestSchema.safeParse({ email: "a@b.test", next: "/my/jobs/abc" }).success).toBe(true);
    expect(linkRequestSchema.safeParse({ email: "a@b.test", next: "https://elsewhere.test/" }).success).toBe(false);
    // "//host" is a protocol-relative address: it would leave the site.
    expect(linkRequestSchema.safeParse({ email: "a@b.test", next: "//elsewhere" }).success).toBe(false);
  });

  it("accepts only well-formed link tokens (32 random bytes, base64url)", () => {
    expect(linkTokenSchema.safeParse({ token: "A".repeat(43) }).success).toBe(true);
    expect(linkTokenSchema.safeParse({ token: "A".repeat(42) }).success).toBe(false);
    expect(linkTokenSchema.safeParse({ token: `${"A".repeat(42)}=` }).success).toBe(false);
  });
});

describe("overdue", () => {
  // common trade practice, no published source: a job is late once the promised day has passed
  // and the machine is not yet ready or collected.
  it("is late only after the promised day, and only while still being worked on", () => {
    expect(isOverdue({ status: "in_progress", promisedOn: "2026-11-30" }, "2026-12-01")).toBe(true);
    expect(isOverdue({ status: "in_progress", promisedOn: "2026-12-01" }, "2026-12-01")).toBe(false);
    expect(isOverdue({ status: "ready", promisedOn: "2026-11-01" }, "2026-12-01")).toBe(false);
    expect(isOverdue({ status: "waiting_parts", promisedOn: null }, "2026-12-01")).toBe(false);
  });
});

describe("overdue by how much, and on whose calendar", () => {
  // common trade practice, no published source: days late are whole calendar days after the promised day.
  it("counts whole days past the promised date, across a month end", () => {
    expect(daysOverdue({ status: "in_progress", promisedOn: "2026-11-28" }, "2026-12-01")).toBe(3);
    expect(daysOverdue({ status: "waiting_parts", promisedOn: "2026-11-30" }, "2026-12-01")).toBe(1);
    expect(daysOverdue({ status: "in_progress", promisedOn: "2026-12-01" }, "2026-12-01")).toBeNull();
    expect(daysOverdue({ status: "ready", promisedOn: "2026-11-01" }, "2026-12-01")).toBeNull();
    expect(overdueLabel(1)).toBe("Overdue 1 day");
    expect(overdueLabel(3)).toBe("Overdue 3 days");
  });

  it("flags overdue and waiting on parts separately, or both", () => {
    expect(jobAttention({ status: "waiting_parts", promisedOn: "2026-11-30" }, "2026-12-01")).toEqual(["overdue", "waiting_parts"]);
    expect(jobAttention({ status: "waiting_parts", promisedOn: null }, "2026-12-01")).toEqual(["waiting_parts"]);
    expect(jobAttention({ status: "checked_in", promisedOn: "2026-12-05" }, "2026-12-01")).toEqual([]);
  });

  it("reads today off the shop's own time zone", () => {
    const noonUtc = new Date("2026-12-01T12:00:00Z");
    // IANA tz database: Pacific/Kiritimati is UTC+14 all year; America/Denver is UTC−7 in December (MST).
    expect(shopToday("Pacific/Kiritimati", noonUtc)).toBe("2026-12-02");
    expect(shopToday("America/Denver", new Date("2026-12-02T05:00:00Z"))).toBe("2026-12-01");
    expect(shopToday("UTC", noonUtc)).toBe("2026-12-01");
  });
});

describe("check-in form", () => {
  const newOwner = {
    customerMode: "new",
    customerName: "  Hollis Varga ",
    customerEmail: " Hollis@Mail.TEST ",
    customerPhone: "",
    machineKind: "side_by_side",
    machineYear: "2017",
    machineMake: "Gravik",
    machineModel: "Hauler 800",
    machineEngineCc: "799",
    machineSerial: " GVH8-17-20931 ",
    machineHours: "",
    machineOdometer: "6,120",
    machineOdometerUnit: "mi",
    concern: " Runs hot on long climbs. ",
    intakeNotes: "",
    promisedOn: "2026-12-12",
    technicianId: "7",
  };
  const messages = (raw: Record<string, unknown>) => {
    const r = checkInSchema.safeParse(raw);
    expect(r.success).toBe(false);
    return Object.fromEntries(r.error!.issues.map((i) => [i.path.join("."), i.message]));
  };

  it("turns a new owner's form into a tidy check-in", () => {
    expect(checkInSchema.parse(newOwner)).toEqual({
      customer: { mode: "new", name: "Hollis Varga", email: "hollis@mail.test", phone: null },
      machine: {
        mode: "new",
        kind: "side_by_side",
        year: 2017,
        make: "Gravik",
        model: "Hauler 800",
        engineCc: 799,
        serial: "GVH8-17-20931",
        hours: null,
        odometer: 6120,
        odometerUnit: "mi",
      },
      concern: "Runs hot on long climbs.",
      intakeNotes: null,
      promisedOn: "2026-12-12",
      technicianId: 7,
      // No box ticked: no text consent recorded at check-in.
      textConsent: false,
    });
  });

  it("takes an owner and machine on file by id", () => {
    const r = checkInSchema.parse({ customerMode: "existing", customerId: "12", machineMode: "existing", machineId: "40", concern: "Squeal" });
    expect(r.customer).toEqual({ mode: "existing", id: 12 });
    expect(r.machine).toEqual({ mode: "existing", id: 40 });
  });

  it("needs the owner's concern in words", () => {
    expect(messages({ ...newOwner, concern: "   " }).concern).toBe("Write down the owner's concern in their own words");
    expect(messages({ ...newOwner, concern: undefined }).concern).toBe("Write down the owner's concern in their own words");
    expect(messages({ ...newOwner, concern: "x".repeat(4001) }).concern).toBe("The concern is at most 4000 characters");
  });

  it("refuses a year outside 1900 to next year, and one that isn't a number", () => {
    const msg = `Year is four digits, from 1900 to ${LATEST_MODEL_YEAR}`;
    expect(messages({ ...newOwner, machineYear: "1850" }).machineYear).toBe(msg);
    expect(messages({ ...newOwner, machineYear: String(LATEST_MODEL_YEAR + 1) }).machineYear).toBe(msg);
    expect(messages({ ...newOwner, machineYear: "20x9" }).machineYear).toBe(msg);
    expect(checkInSchema.parse({ ...newOwner, machineYear: String(LATEST_MODEL_YEAR) }).machine).toMatchObject({ year: LATEST_MODEL_YEAR });
  });

  it("reads hours to one decimal place and needs a unit for an odometer reading", () => {
    expect(checkInSchema.parse({ ...newOwner, machineHours: "312,4" }).machine).toMatchObject({ hours: 312.4 });
    expect(messages({ ...newOwner, machineHours: "312.45" }).machineHours).toBe("Hours like 312 or 312.4 (one decimal place)");
    expect(messages({ ...newOwner, machineHours: "-3" }).machineHours).toBe("Hours like 312 or 312.4 (one decimal place)");
    expect(messages({ ...newOwner, machineOdometerUnit: "" }).machineOdometerUnit).toBe("Say whether the odometer reads km or miles");
    expect(messages({ ...newOwner, machineOdometerUnit: "furlongs" }).machineOdometerUnit).toBe("Pick km or miles");
  });

  it("says every missing piece of a new owner and machine at once, beside its field", () => {
    expect(messages({ customerMode: "new", concern: "" })).toEqual({
      concern: "Write down the owner's concern in their own words",
      customerName: "Enter the owner's name",
      customerEmail: "Give an e-mail or a phone number so the shop can reach the owner",
      machineKind: "Pick the kind of machine",
      machineMake: "Enter the make",
      machineModel: "Enter the model",
    });
  });

  it("a new owner's machine is always new, whatever the form says", () => {
    expect(messages({ ...newOwner, machineMode: "existing", machineId: "40", machineMake: "" }).machineMake).toBe("Enter the make");
  });

  it("needs an owner on file to be picked, and refuses malformed ids, e-mails, phones and dates", () => {
    expect(messages({ customerMode: "existing", machineMode: "existing", concern: "c" })).toEqual({
      customerId: "Search for the owner and pick them, or add a new owner",
      machineId: "Pick one of the owner's machines, or add a new one",
    });
    expect(messages({ customerMode: "existing", customerId: "12; DROP TABLE", machineMode: "new", concern: "c" }).customerId).toBe("Pick the owner from the search results");
    expect(messages({ customerMode: "maybe", concern: "c" }).customerMode).toBe("Choose an owner on file or add a new one");
    expect(messages({ ...newOwner, customerEmail: "not-an-address" }).customerEmail).toBe("That doesn't look like an e-mail address");
    expect(messages({ ...newOwner, customerPhone: "call me" }).customerPhone).toBe("Use digits, spaces, brackets, dashes and a leading + only");
    expect(messages({ ...newOwner, promisedOn: "2026-02-30" }).promisedOn).toBe("Pick a real date (YYYY-MM-DD)");
    expect(messages({ ...newOwner, technicianId: "0" }).technicianId).toBe("Pick someone from the list");
  });

  it("carries the shop's slug for the server action, and nothing else unknown", () => {
    expect(checkInFormSchema.parse({ ...newOwner, shop: "copper-gulch", role: "owner" })).toMatchObject({ shop: "copper-gulch", input: { concern: "Runs hot on long climbs." } });
    expect(checkInFormSchema.safeParse({ ...newOwner, shop: "../other" }).success).toBe(false);
  });

  it("keeps the promised date on or after today on the shop's calendar", () => {
    expect(promisedOnProblem("2026-11-30", "2026-12-01")).toBe("The promised date can't be in the past: pick 2026-12-01 (today) or later");
    expect(promisedOnProblem("2026-12-01", "2026-12-01")).toBeNull();
    expect(promisedOnProblem("2027-01-05", "2026-12-01")).toBeNull();
    expect(promisedOnProblem(null, "2026-12-01")).toBeNull();
  });

  it("caps the owner search", () => {
    expect(customerSearchQuerySchema.parse({})).toEqual({ q: "" });
    expect(customerSearchQuerySchema.safeParse({ q: "x".repeat(101) }).success).toBe(false);
  });
});
