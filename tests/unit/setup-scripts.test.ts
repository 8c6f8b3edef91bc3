import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
// @ts-expect-error -- plain ESM without type declarations (it must run before node_modules exists)
import { SetupError, acquireLock, isAlive, readDotEnv } from "../../scripts/lib/setup.mjs";
// @ts-expect-error -- plain ESM without type declarations
import { startService } from "../../scripts/lib/processes.mjs";
// @ts-expect-error -- plain ESM without type declarations
import { Restarter, restartDelay } from "../../scripts/lib/restart.mjs";

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

describe("npm start keeps local services up", () => {
  it("waits 1 s, 2 s, 4 s … at most 30 s between restarts of a service that keeps failing", () => {
    // The policy of issue 14 (common trade practice, no published source): doubling, capped at 30 s.
    expect([0, 1, 2, 3, 4, 5, 6, 40].map((n) => restartDelay(n))).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000, 30000]);
  });

  it("restarts a child that exits, with growing pauses and a log line each time, and stops restarting on stop()", async () => {
    const lines: string[] = [];
    const startedAt: number[] = [];
    const restarter = new Restarter({
      name: "The flaky helper",
      policy: { baseMs: 100, maxMs: 400, stableMs: 10_000 },
      log: (line: string) => lines.push(line),
      start: () =>
        new Promise((resolve) => {
          startedAt.push(Date.now());
          startService("flaky", process.execPath, ["-e", "process.exit(3)"], {}, { onExit: (code: number | null, signal: string | null) => resolve({ code, signal }) });
        }),
    });
    await waitUntil(() => startedAt.length >= 5, 10_000);
    restarter.stop();
    const gaps = startedAt.slice(1, 5).map((t, i) => t - startedAt[i]!);
    // Each pause at least the policy's, and not much more (a child takes tens of ms to spawn and exit).
    [100, 200, 400, 400].forEach((pause, i) => {
      expect(gaps[i]).toBeGreaterThanOrEqual(pause);
      expect(gaps[i]).toBeLessThan(pause + 1500);
    });
    expect(lines[0]).toBe("The flaky helper stopped unexpectedly (exit 3); restarting it in 100 ms.");
    expect(lines[2]).toContain("restarting it in 400 ms");
    const count = startedAt.length;
    await new Promise((r) => setTimeout(r, 700));
    expect(startedAt.length).toBe(count);
  }, 20_000);

  it("starts the pauses short again after a run that stayed up", async () => {
    const lines: string[] = [];
    const restarter = new Restarter({
      name: "The steady helper",
      policy: { baseMs: 50, maxMs: 1000, stableMs: 200 },
      log: (line: string) => lines.push(line),
      start: () =>
        new Promise((resolve) => {
          startService("steady", process.execPath, ["-e", "setTimeout(() => process.exit(1), 300)"], {}, { onExit: (code: number | null) => resolve({ code }) });
        }),
    });
    await waitUntil(() => lines.length >= 3, 10_000);
    restarter.stop();
    // Every run lasted past stableMs, so no pause grew.
    for (const line of lines.slice(0, 3)) expect(line).toContain("restarting it in 50 ms");
  }, 20_000);

  it("a run with restarts keeps going when a service dies and stops everything on Ctrl-C; without, one death stops the run", async () => {
    const dir = tempDir();
    const pidFile = path.join(dir, "steady.pid");
    const steady = `require("fs").writeFileSync(${JSON.stringify(pidFile)}, String(process.pid)); setInterval(() => {}, 1000);`;
    const script = (restart: boolean) => `
      import { Run } from ${JSON.stringify(path.join(process.cwd(), "scripts/lib/processes.mjs"))};
      const run = new Run("t", { restart: ${restart} });
      run.serve("The dying helper", process.execPath, ["-e", "setTimeout(() => process.exit(4), 100)"], {});
      run.serve("The steady helper", process.execPath, ["-e", ${JSON.stringify(steady)}], {});
      setInterval(() => {}, 1000);
    `;
    const runScript = (restart: boolean, { interruptOn }: { interruptOn?: string } = {}) => {
      const file = path.join(dir, `run-${restart}.mjs`);
      fs.writeFileSync(file, script(restart));
      const child = spawn(process.execPath, [file], { stdio: ["ignore", "pipe", "pipe"] });
      let output = "";
      let interrupted = false;
      const collect = (d: Buffer) => {
        output += d;
        // Ctrl-C once the run has shown what we wait for.
        if (interruptOn && !interrupted && output.includes(interruptOn)) {
          interrupted = true;
          child.kill("SIGINT");
        }
      };
      child.stdout.on("data", collect);
      child.stderr.on("data", collect);
      return new Promise<{ code: number | null; output: string }>((resolve) => child.on("exit", (code) => resolve({ code, output })));
    };

    // npm test's behaviour: the run stops (exit 1) as soon as one service dies.
    const strict = await runScript(false);
    expect(strict.code).toBe(1);
    expect(strict.output).toContain("The dying helper stopped unexpectedly (exit 4); stopping everything.");

    // npm start's: restarted after 1 s, dies again (next pause 2 s), the other service untouched; Ctrl-C (SIGINT) stops it all (exit 130).
    const kept = await runScript(true, { interruptOn: "restarting it in 2 s." });
    expect(kept.code).toBe(130);
    expect(kept.output).toContain("The dying helper stopped unexpectedly (exit 4); restarting it in 1 s.");
    expect(kept.output).toContain("restarting it in 2 s.");
    expect(kept.output).not.toContain("The steady helper stopped");
    // Nothing left behind: the helper that never died was stopped with the run.
    const steadyPid = Number(fs.readFileSync(pidFile, "utf8"));
    await waitUntil(() => !isAlive(steadyPid), 5000);
  }, 20_000);
});

async function waitUntil(done: () => boolean, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs;
  while (!done()) {
    if (Date.now() > deadline) throw new Error("timed out");
    await new Promise((r) => setTimeout(r, 20));
  }
}
