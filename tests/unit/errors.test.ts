import { describe, expect, it } from "vitest";
import { z } from "zod";
import { AppError, toErrorBody } from "@/lib/errors";

describe("error bodies", () => {
  it("keeps an AppError's code, message and fields, with the matching HTTP status", () => {
    const { status, body } = toErrorBody(new AppError("forbidden", "You don't have access to this."));
    expect(status).toBe(403);
    expect(body).toEqual({ error: { code: "forbidden", message: "You don't have access to this." } });
    expect(toErrorBody(new AppError("rate_limited", "Slow down.")).status).toBe(429);
  });

  it("turns a zod failure into 422 with a message per field", () => {
    const schema = z.object({ email: z.email({ error: "Not an address" }), qty: z.number().int().min(1, "At least one") });
    const parsed = schema.safeParse({ email: "x", qty: 0 });
    const { status, body } = toErrorBody(parsed.error);
    expect(status).toBe(422);
    expect(body.error.code).toBe("invalid");
    expect(body.error.fields).toEqual({ email: ["Not an address"], qty: ["At least one"] });
  });

  it("never passes an unexpected error's text to the client", () => {
    const { status, body } = toErrorBody(new Error("ER_ACCESS_DENIED_ERROR for user 'benchside'@'127.0.0.1'"));
    expect(status).toBe(500);
    expect(JSON.stringify(body)).not.toContain("benchside");
    expect(body.error.code).toBe("internal");
  });
});
