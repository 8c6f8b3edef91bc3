import { describe, expect, it } from "vitest";
import { linkRequestSchema, linkTokenSchema, passwordSignInSchema } from "@/lib/schemas/auth";
import { formatJobNumber, jobListQuerySchema, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { isOverdue } from "@/lib/jobs-view";

describe("job list query", () => {
  it("fills defaults for an empty query", () => {
    expect(jobListQuerySchema.parse({})).toEqual({ q: "", status: [], sort: "updated", dir: "desc", page: 1, pageSize: 25 });
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
