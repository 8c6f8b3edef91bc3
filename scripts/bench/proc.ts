// Child servers for the benches, and their memory as the kernel sees it (/proc, so Linux only).
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

export const ROOT = fileURLToPath(new URL("../..", import.meta.url));

export type ChildServer = { pid: number; url: string; stop(): Promise<void> };

/**
 * Runs `node --import tsx <script>` from the project root (node itself, not the tsx CLI, so `pid` is the
 * server and not a wrapper) and resolves once its stdout prints a line matching `ready` (group 1: its URL).
 */
export function startChildServer(script: string, env: Record<string, string>, ready: RegExp, timeoutMs = 30_000): Promise<ChildServer> {
  const child = spawn(process.execPath, ["--import", "tsx", script], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
  let output = "";
  return new Promise((resolve, reject) => {
    const fail = (why: string) => {
      clearTimeout(timer);
      child.kill("SIGKILL");
      reject(new Error(`${script}: ${why}${output ? `\n${output.trim()}` : ""}`));
    };
    const timer = setTimeout(() => fail(`not ready within ${timeoutMs} ms`), timeoutMs);
    const onExit = (code: number | null) => fail(`exited (code ${code}) before it was ready`);
    child.once("exit", onExit);
    child.stderr.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.stdout.on("data", (chunk: Buffer) => {
      output += chunk.toString();
      const url = ready.exec(output)?.[1];
      if (url === undefined || child.pid === undefined) return;
      clearTimeout(timer);
      child.off("exit", onExit);
      resolve({ pid: child.pid, url, stop: () => stopChild(child) });
    });
  });
}

function stopChild(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    const killer = setTimeout(() => child.kill("SIGKILL"), 10_000);
    child.once("exit", () => {
      clearTimeout(killer);
      resolve();
    });
    child.kill("SIGTERM");
  });
}

const KIB = 1024;

/** VmRSS and VmHWM (peak RSS) of a process, in bytes. */
export function memoryOf(pid: number): { rss: number; peak: number } {
  const status = readFileSync(`/proc/${pid}/status`, "utf8");
  const field = (name: string) => {
    const kib = new RegExp(`^${name}:\\s+(\\d+) kB`, "m").exec(status)?.[1];
    if (kib === undefined) throw new Error(`/proc/${pid}/status has no ${name}`);
    return Number(kib) * KIB;
  };
  return { rss: field("VmRSS"), peak: field("VmHWM") };
}

export type MemoryGrowth = { baseline: number; peak: number; growth: number; samples: number; hwmReset: boolean };

/**
 * Samples RSS every `everyMs` from now until stop(). The kernel's peak (VmHWM) is reset first when we may
 * (writing 5 to clear_refs; our own child), so a spike between two samples is still counted.
 */
export function sampleMemory(pid: number, everyMs = 100): { stop(): MemoryGrowth } {
  let hwmReset = true;
  try {
    writeFileSync(`/proc/${pid}/clear_refs`, "5");
  } catch {
    hwmReset = false;
  }
  const baseline = memoryOf(pid).rss;
  let peak = baseline;
  let samples = 1;
  const timer = setInterval(() => {
    peak = Math.max(peak, memoryOf(pid).rss);
    samples += 1;
  }, everyMs);
  return {
    stop() {
      clearInterval(timer);
      const now = memoryOf(pid);
      peak = Math.max(peak, now.rss, hwmReset ? now.peak : 0);
      return { baseline, peak, growth: peak - baseline, samples: samples + 1, hwmReset };
    },
  };
}
