import { describe, expect, it } from "vitest";
import { z } from "zod";
import { toErrorBody } from "@/lib/error-body";
import { AppError, DATABASE_UNAVAILABLE_MESSAGE, isDatabaseUnavailable } from "@/lib/errors";

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

  // The shapes mysql2 and knex give these failures (tests/integration/db-outage.test.ts meets the
  // real ones with a killed server); only the code/name/errno/fatal fields are looked at.
  it("a database that can't be reached is a 503 'unavailable', whatever the driver's words", () => {
    const refused = Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:3307"), { code: "ECONNREFUSED", errno: -111, fatal: true });
    const lost = Object.assign(new Error("Connection lost: The server closed the connection."), { code: "PROTOCOL_CONNECTION_LOST", fatal: true });
    const full = Object.assign(new Error("Too many connections"), { code: "ER_CON_COUNT_ERROR", errno: 1040 });
    const pool = Object.assign(new Error("Knex: Timeout acquiring a connection. The pool is probably full."), { name: "KnexTimeoutError" });
    const closed = Object.assign(new Error("Can't add new command when connection is in closed state"), { fatal: true });
    // A Galera node that isn't synced yet (MariaDB Galera Cluster docs: ER_UNKNOWN_COM_ERROR 1047 while
    // wsrep_ready is OFF), and a deadlock that outlived db/transaction.ts's retries: busy, so retry later.
    const notSynced = Object.assign(new Error("WSREP has not yet prepared node for application use"), { code: "ER_UNKNOWN_COM_ERROR", errno: 1047 });
    const deadlock = Object.assign(new Error("Deadlock found when trying to get lock"), { code: "ER_LOCK_DEADLOCK", errno: 1213 });
    for (const error of [refused, lost, full, pool, closed, notSynced, deadlock]) {
      expect(toErrorBody(error), error.message).toEqual({ status: 503, body: { error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } } });
    }
  });

  it("other failures are not taken for the database", () => {
    // fetch to another service: the socket code is on the cause, and nothing is marked fatal.
    const fetchFailed = new TypeError("fetch failed", { cause: Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:4010"), { code: "ECONNREFUSED" }) });
    const duplicate = Object.assign(new Error("Duplicate entry"), { code: "ER_DUP_ENTRY", errno: 1062 });
    for (const error of [fetchFailed, duplicate]) {
      expect(isDatabaseUnavailable(error), error.message).toBe(false);
      expect(toErrorBody(error).status).toBe(500);
    }
  });
});
