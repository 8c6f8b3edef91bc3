import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
// @ts-expect-error -- plain ESM without type declarations (it must run before node_modules exists)
import { SetupError, acquireLock, readDotEnv } from "../../scripts/lib/setup.mjs";

const tempDir = () => fs.mkdtempSync(path.join(os.tmpdir(), "bs-setup-"));

describe("one runner per data folder", () => {
  it("refuses a second run while the first is alive, naming it", () => {
    const dir = tempDir();
    const release = acquireLock(dir, { label: "Benchside (npm start)", url: "http://localhost:3000" });
    expect(() => acquireLock(dir, { label: "Benchside (npm start)" })).toThrow(SetupError);
    expect(() => acquireLock(dir, { label: "Benchside (npm start)" })).toThrow(`already running (process ${process.pid}, http://localhost:3000)`);
    release();
    const again = acquireLock(dir, { label: "Benchside (npm start)" });
    again();
  });

  it("takes over a lock left by a run that no longer exists", () => {
    const dir = tempDir();
    // PIDs are capped well below this on Linux (pid_max ≤ 2^22), so no process has it.
    fs.writeFileSync(path.join(dir, "run.lock"), JSON.stringify({ pid: 2 ** 22 + 1 }));
    const release = acquireLock(dir, { label: "x" });
    expect(JSON.parse(fs.readFileSync(path.join(dir, "run.lock"), "utf8")).pid).toBe(process.pid);
    release();
    expect(fs.existsSync(path.join(dir, "run.lock"))).toBe(false);
  });
});

describe(".env reading", () => {
  it("reads KEY=VALUE lines, skipping comments and unquoting values", () => {
    const file = path.join(tempDir(), ".env");
    fs.writeFileSync(file, ['# a comment', "PORT=3005", 'MAIL_FROM="Shop <a@b.test>"', "EMPTY=", "not a setting", "URL=mysql://u:p@h:1/d?x=1"].join("\n"));
    expect(readDotEnv(file)).toEqual({ PORT: "3005", MAIL_FROM: "Shop <a@b.test>", EMPTY: "", URL: "mysql://u:p@h:1/d?x=1" });
    expect(readDotEnv(path.join(tempDir(), "missing.env"))).toEqual({});
  });
});
