import fs from "node:fs";
import { type APIRequestContext, expect, request, test } from "@playwright/test";
import type mysql from "mysql2/promise";
import { declarationId, scanDeclarations } from "../support/declarations";
import { attackCases } from "./access/attacks";
import { type Call, actionKey, isStateChanging, planCalls, uncallable } from "./access/calls";
import { changedTables, checksums, connect, holdMailWorker, waitForQuiet } from "./access/checksums";
import { ANONYMOUS_COOKIE, APP_URL, type ActionRef, type Seen, classify, describeSeen, pool, readActionManifest } from "./access/client";
import { PERSONA_NAMES, type PersonaName } from "./access/expected";
import { type Fixture, makeFixture, removeFixture, restoreShopSettings, saveShopSettings } from "./access/fixture";
import { storageStatePath } from "./personas";

// The access test, generated: every route handler method and every server action found in the
// source (tests/support/declarations.ts) × every persona, called as plain HTTP the way a browser
// would, must get what the permission table says (tests/e2e/access/expected.ts). Refused calls
// run first, a declaration at a time, each between two CHECKSUM TABLE readings of the whole
// database that must agree; the allowed ones run after, on the test's own job (access/fixture.ts).
// Then the attacker cases of issue 22. Adding a handler or action that isn't a declaration, or
// that the test can't call, fails the first test.

const scan = scanDeclarations();
/** Declarations whose refused calls share one pair of checksum readings (one pair each if something wrote). */
const REFUSED_BATCH = 8;
const SIGN_OUTS = new Set(["app/(auth)/sign-in/actions.ts#signOutAction", "app/(auth)/sign-in/actions.ts#signOutEverywhereAction"]);

function manifest(): Map<string, ActionRef> | null {
  try {
    return readActionManifest();
  } catch {
    return null;
  }
}

test("every handler and action is a readable declaration the test can call", () => {
  expect(scan.problems, "exports that aren't route() / formAction() declarations the test can read").toEqual([]);
  const refs = manifest();
  expect(refs, "the build's server-reference manifest (run through `npm test`)").not.toBeNull();
  expect(uncallable(scan, refs)).toEqual([]);
});

test("every persona × handler and action gets what the table says; refused ones write nothing; attackers are refused", async ({}, testInfo) => {
  test.setTimeout(280_000);
  const refs = manifest()!;
  const db: mysql.Connection = await connect();
  const contexts = new Map<PersonaName, APIRequestContext>();
  for (const p of PERSONA_NAMES) {
    contexts.set(p, await request.newContext(p === "anonymous" ? { baseURL: APP_URL, extraHTTPHeaders: { cookie: ANONYMOUS_COOKIE } } : { baseURL: APP_URL, storageState: storageStatePath(p) }));
  }
  const ctx = (p: PersonaName) => contexts.get(p)!;
  const saved = await saveShopSettings(db, "copper-gulch");
  // Sign-outs end sessions, and so would a sign-out that wasn't refused: all are put back at the end.
  const [liveRows] = await db.query<mysql.RowDataPacket[]>("SELECT id FROM user_sessions WHERE ended_at IS NULL");
  let fixture: Fixture | null = null;
  let madeJob = 0;
  const mismatches: string[] = [];
  const exercised = new Set<string>();
  const tally: Record<string, number> = {};
  // Every call and its answer, for reading after the run: test-results/…/calls.json.
  const log: { call: string; persona: PersonaName; expected: string; got: string; seen: string }[] = [];
  const record = (c: Call, seen: Seen) => {
    const got = classify(seen);
    log.push({ call: c.label, persona: c.persona, expected: c.expected, got, seen: describeSeen(seen) });
    exercised.add(declarationId(c.decl));
    tally[`${c.expected === got ? "as expected" : "MISMATCH"}: ${c.expected}`] = (tally[`${c.expected === got ? "as expected" : "MISMATCH"}: ${c.expected}`] ?? 0) + 1;
    if (got !== c.expected) mismatches.push(`${c.label} as ${c.persona}: expected ${c.expected}, got ${got} (${describeSeen(seen)})`);
  };

  try {
    const action = (key: string) => {
      const ref = refs.get(key);
      if (!ref) throw new Error(`${key} is not in the build's manifest`);
      return ref;
    };
    fixture = await test.step("the test's own job, made through the app", () => makeFixture({ db, as: ctx, action, made: (jobId) => (madeJob = jobId) }));
    const calls = planCalls(scan, fixture, refs);
    const byLabel = new Map<string, Call[]>();
    for (const c of calls) byLabel.set(c.label, [...(byLabel.get(c.label) ?? []), c]);

    await test.step(`refused calls: ${calls.filter((c) => c.expected !== "allowed").length}, a few declarations at a time between two checksums`, async () => {
      // The mail worker's clock-driven writes would be taken for a refused call's (checksums.ts).
      const resumeWorker = holdMailWorker();
      try {
        await waitForQuiet(db);
        const groups = [...byLabel.entries()].map(([label, group]) => ({ label, refused: group.filter((c) => c.expected !== "allowed") })).filter((g) => g.refused.length);
        for (let i = 0; i < groups.length; i += REFUSED_BATCH) {
          const batch = groups.slice(i, i + REFUSED_BATCH);
          const before = await checksums(db);
          const refused = batch.flatMap((g) => g.refused);
          const seen = await pool(refused, 8, (c) => c.run(ctx(c.persona)));
          refused.forEach((c, j) => record(c, seen[j]!));
          const changedByBatch = changedTables(before, await checksums(db));
          if (!changedByBatch.length) continue;
          // Something wrote: find which declaration, calling each again on its own.
          const found = mismatches.length;
          for (const g of batch) {
            const alone = await checksums(db);
            await Promise.all(g.refused.map((c) => c.run(ctx(c.persona))));
            const changed = changedTables(alone, await checksums(db));
            if (changed.length) mismatches.push(`${g.label}: refused calls changed ${changed.join(", ")}`);
          }
          if (mismatches.length === found) mismatches.push(`refused calls of ${batch.map((g) => g.label).join(", ")} changed ${changedByBatch.join(", ")} (not again one by one)`);
        }
      } finally {
        resumeWorker();
      }
    });

    await test.step("allowed calls: reads, then writes on the test's own job, then sign-outs", async () => {
      const allowed = calls.filter((c) => c.expected === "allowed");
      const isSignOut = (c: Call) => c.decl.kind === "action" && SIGN_OUTS.has(actionKey(c.decl));
      const reads = allowed.filter((c) => !isStateChanging(c.decl));
      const writes = allowed.filter((c) => isStateChanging(c.decl) && !isSignOut(c));
      const beforeWrites = await checksums(db);
      for (const batch of [reads, writes]) {
        const seen = await pool(batch, 4, (c) => c.run(ctx(c.persona)));
        batch.forEach((c, i) => record(c, seen[i]!));
      }
      // The same readings do see writes: the allowed ones wrote entries, records, payments.
      expect(changedTables(beforeWrites, await checksums(db)), "tables the allowed writes changed").toEqual(expect.arrayContaining(["journal_entries", "torque_records", "payments"]));
      // Each sign-out with a session of its own, so the persona's shared one stays signed in.
      for (const c of allowed.filter(isSignOut)) {
        const own = await request.newContext(c.persona === "anonymous" ? { baseURL: APP_URL, extraHTTPHeaders: { cookie: ANONYMOUS_COOKIE } } : { baseURL: APP_URL, storageState: storageStatePath(c.persona) });
        record(c, await c.run(own));
        await own.dispose();
        await db.query("UPDATE user_sessions SET ended_at = NULL, ended_reason = NULL WHERE id IN (?)", [liveRows.map((r) => r.id)]);
      }
    });

    await test.step("attacker cases (issue 22), each case between two checksums", async () => {
      const resumeWorker = holdMailWorker();
      try {
        await waitForQuiet(db);
        for (const { name, attacks } of attackCases(calls, (c) => ctx(c.persona))) {
          expect(attacks.length, `${name}: something to attack`).toBeGreaterThan(0);
          const before = await checksums(db);
          const seen = await pool(attacks, 4, (a) => (a.send ? a.send(a.call) : a.call.run(ctx(a.call.persona), a.headers)));
          attacks.forEach((a, i) => {
            const held = a.check(seen[i]!);
            log.push({ call: `${name}: ${a.call.label}`, persona: a.call.persona, expected: a.wants, got: held ? "as wanted" : "NOT REFUSED AS WANTED", seen: describeSeen(seen[i]!) });
            if (!held) mismatches.push(`${name}: ${a.call.label} as ${a.call.persona}: wanted ${a.wants}, got ${describeSeen(seen[i]!)}`);
          });
          const changed = changedTables(before, await checksums(db));
          if (changed.length) mismatches.push(`${name}: changed ${changed.join(", ")}`);
        }
      } finally {
        resumeWorker();
      }
    });

    const all = [...scan.handlers, ...scan.actions].map(declarationId);
    const missed = all.filter((id) => !exercised.has(id));
    const handlerIds = new Set(scan.handlers.map(declarationId));
    console.log(
      `access test: ${all.length - missed.length}/${all.length} declarations exercised ` +
        `(${[...exercised].filter((id) => handlerIds.has(id)).length}/${scan.handlers.length} handler methods, ` +
        `${[...exercised].filter((id) => !handlerIds.has(id)).length}/${scan.actions.length} server actions), ` +
        `${calls.length} persona calls: ${JSON.stringify(tally)}`,
    );
    expect(missed, "declarations no call reached (coverage must be 100 %)").toEqual([]);
  } finally {
    await removeFixture(db, { run: fixture?.run, jobId: madeJob });
    await restoreShopSettings(db, saved);
    if (liveRows.length) await db.query("UPDATE user_sessions SET ended_at = NULL, ended_reason = NULL WHERE id IN (?)", [liveRows.map((r) => r.id)]);
    for (const c of contexts.values()) await c.dispose();
    await db.end();
    fs.writeFileSync(testInfo.outputPath("calls.json"), JSON.stringify(log, null, 1));
  }
  expect(mismatches).toEqual([]);
});
