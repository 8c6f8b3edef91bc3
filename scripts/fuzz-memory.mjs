// `node scripts/fuzz-memory.mjs`: what the app holds after a long run of malformed requests
// (issue 14). Not part of `npm test`; dependency-free. It runs the fuzz test's long form through
// `npm test` (scripts/test.mjs: its own build, MariaDB, fakes and ports), with the app's node
// able to write a heap snapshot on SIGUSR2, and the app kept up idle afterwards (FUZZ_HOLD_S).
// Meanwhile it samples the app's memory every 2 s and takes three heap snapshots: before the
// fuzzing, right after it, and at the end of the idle time. Then it prints what grew.
//   FUZZ_REQUESTS (default 200000), FUZZ_HOLD_S (default 600), MALLOC_ARENA_MAX and
//   FUZZ_APP_NODE_OPTIONS (e.g. --max-old-space-size=256) are passed on to try settings.
// Output: .data/fuzz-memory/<time>/ (rss.csv, the snapshots, report.txt).
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { ROOT, sleep } from "./lib/setup.mjs";
import { compare, retainers, summarise } from "./lib/heap-snapshot.mjs";

const PORT = Number(process.env.TEST_APP_PORT ?? 3110);
const OUT = path.join(ROOT, ".data", "fuzz-memory", new Date().toISOString().replace(/[:.]/g, "-"));
fs.mkdirSync(OUT, { recursive: true });
const report = [];
const note = (line) => {
  console.log(`[fuzz-memory] ${line}`);
  report.push(line);
};

/** The pid of the process listening on `port` (from /proc: the socket's inode, then whose fd it is). */
function listenerPid(port) {
  const hex = port.toString(16).toUpperCase().padStart(4, "0");
  const inodes = new Set();
  for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    if (!fs.existsSync(table)) continue;
    for (const line of fs.readFileSync(table, "utf8").split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      if (cols[1]?.endsWith(`:${hex}`) && cols[3] === "0A") inodes.add(cols[9]);
    }
  }
  for (const pid of fs.readdirSync("/proc").filter((p) => /^\d+$/.test(p))) {
    try {
      for (const fd of fs.readdirSync(`/proc/${pid}/fd`)) {
        const m = /^socket:\[(\d+)\]$/.exec(fs.readlinkSync(`/proc/${pid}/fd/${fd}`));
        if (m && inodes.has(m[1])) return Number(pid);
      }
    } catch {
      // Gone, or not ours to look at.
    }
  }
  return null;
}

/** VmRSS and VmHWM of a process, in MiB. */
function memoryOf(pid) {
  const status = fs.readFileSync(`/proc/${pid}/status`, "utf8");
  const kib = (key) => Number(new RegExp(`^${key}:\\s+(\\d+)`, "m").exec(status)?.[1] ?? 0);
  return { rss: kib("VmRSS") / 1024, peak: kib("VmHWM") / 1024 };
}

/**
 * Where the RSS is, from /proc/<pid>/smaps: glibc's main heap ([heap], grown with brk), other
 * anonymous memory (V8's heap pages, other malloc arenas, buffers), and mapped files (code).
 */
function rssParts(pid) {
  const parts = { "malloc [heap]": 0, anonymous: 0, files: 0, other: 0 };
  let where = "other";
  for (const line of fs.readFileSync(`/proc/${pid}/smaps`, "utf8").split("\n")) {
    const head = /^[0-9a-f]+-[0-9a-f]+ \S+ \S+ \S+ \S+\s*(.*)$/.exec(line);
    if (head) where = head[1] === "[heap]" ? "malloc [heap]" : head[1] === "" ? "anonymous" : head[1].startsWith("/") ? "files" : "other";
    const rss = /^Rss:\s+(\d+) kB/.exec(line);
    if (rss) parts[where] += Number(rss[1]) / 1024;
  }
  return Object.entries(parts).map(([k, v]) => `${k} ${v.toFixed(0)}`).join(", ");
}

let appPid = null;
const marks = {};
const snapshots = [];

async function snapshot(label) {
  if (!appPid) return;
  const before = new Set(fs.readdirSync(OUT));
  const rss = memoryOf(appPid).rss;
  note(`${label}: RSS ${rss.toFixed(0)} MiB (${rssParts(appPid)} MiB)`);
  process.kill(appPid, "SIGUSR2");
  // Written when its size stops changing.
  let file = null;
  let size = -1;
  for (let i = 0; i < 600; i++) {
    await sleep(1000);
    file ??= fs.readdirSync(OUT).find((f) => f.endsWith(".heapsnapshot") && !before.has(f)) ?? null;
    if (!file) continue;
    const now = fs.statSync(path.join(OUT, file)).size;
    if (now === size && now > 0) break;
    size = now;
  }
  if (!file) return note(`${label}: no heap snapshot was written`);
  const named = path.join(OUT, `${snapshots.length + 1}-${label}.heapsnapshot`);
  fs.renameSync(path.join(OUT, file), named);
  snapshots.push({ label, file: named, rss });
  note(`${label}: heap snapshot written`);
}

const env = {
  ...process.env,
  FUZZ_REQUESTS: process.env.FUZZ_REQUESTS ?? "200000",
  FUZZ_HOLD_S: process.env.FUZZ_HOLD_S ?? "600",
  // Every node of the run may write a snapshot on SIGUSR2; only the app is sent one.
  NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ""} --heapsnapshot-signal=SIGUSR2 --diagnostic-dir=${OUT} ${process.env.FUZZ_APP_NODE_OPTIONS ?? ""}`.trim(),
};
note(`FUZZ_REQUESTS=${env.FUZZ_REQUESTS} FUZZ_HOLD_S=${env.FUZZ_HOLD_S} NODE_OPTIONS="${env.NODE_OPTIONS}"${process.env.MALLOC_ARENA_MAX ? ` MALLOC_ARENA_MAX=${process.env.MALLOC_ARENA_MAX}` : ""}`);
const child = spawn("node", ["scripts/test.mjs", "e2e", "tests/e2e/fuzz.spec.ts"], { cwd: ROOT, env, stdio: ["ignore", "pipe", "inherit"] });
const csv = fs.createWriteStream(path.join(OUT, "rss.csv"));
csv.write("seconds,phase,rss_mib\n");
const started = Date.now();
let phase = "start-up";
const sampler = setInterval(() => {
  appPid ??= listenerPid(PORT);
  if (!appPid) return;
  try {
    const { rss, peak } = memoryOf(appPid);
    csv.write(`${((Date.now() - started) / 1000).toFixed(0)},${phase},${rss.toFixed(1)}\n`);
    marks.peak = peak;
  } catch {
    appPid = null;
  }
}, 2000);

let buffered = "";
const queue = [];
child.stdout.on("data", (chunk) => {
  process.stdout.write(chunk);
  buffered += chunk;
  const lines = buffered.split("\n");
  buffered = lines.pop() ?? "";
  for (const line of lines) {
    if (/fuzz: seed \d+/.test(line)) queue.push(async () => {
      appPid = listenerPid(PORT);
      marks.before = memoryOf(appPid).rss;
      phase = "fuzzing";
      await snapshot("before");
    });
    if (/fuzz: \d+ requests in/.test(line)) queue.push(async () => {
      marks.after = memoryOf(appPid).rss;
      phase = "after";
      await snapshot("after-fuzz");
    });
    const hold = /fuzz: holding (\d+) s/.exec(line);
    if (hold) queue.push(async () => {
      phase = "idle";
      await sleep(Math.max(0, Number(hold[1]) * 1000 - 60_000));
      marks.idle = memoryOf(appPid).rss;
      await snapshot("idle");
    });
  }
});
// Snapshots one after another, in the order their moments came.
const worker = (async () => {
  while (child.exitCode === null || queue.length) {
    const next = queue.shift();
    if (next) await next().catch((e) => note(`measurement failed: ${e.message}`));
    else await sleep(200);
  }
})();

child.on("exit", async (code) => {
  clearInterval(sampler);
  await worker;
  csv.end();
  note(`npm test exited with ${code}`);
  const fmt = (v) => (v === undefined ? "?" : `${v.toFixed(0)} MiB`);
  note(`app RSS: before the fuzzing ${fmt(marks.before)}, right after ${fmt(marks.after)}, after the idle time ${fmt(marks.idle)}; peak (VmHWM) ${fmt(marks.peak)}`);
  const summaries = snapshots.map((s) => ({ ...s, summary: summarise(s.file) }));
  for (let i = 1; i < summaries.length; i++) {
    for (const line of compare(`${summaries[i - 1].label} → ${summaries[i].label}`, summaries[i - 1].summary, summaries[i].summary)) note(line);
  }
  const [first, last] = [summaries[0], summaries.at(-1)];
  if (first && last && first !== last) {
    // Who holds what grew most from the first snapshot to the last.
    const grown = [...last.summary.groups].map(([k, g]) => [k, g.size - (first.summary.groups.get(k)?.size ?? 0)]).sort((a, b) => b[1] - a[1]).slice(0, 3);
    for (const [group, grew] of grown) {
      note(`held at "${last.label}", ${group} (+${(grew / 1024 / 1024).toFixed(1)} MiB), its biggest:`);
      for (const chain of retainers(last.file, group)) note(`  ${chain}`);
    }
  }
  if (last?.summary.bigStrings.length) note(`largest strings at "${last.label}": ${last.summary.bigStrings.map((s) => `${(s.size / 1024).toFixed(0)} KiB ${JSON.stringify(s.start)}`).join("; ")}`);
  fs.writeFileSync(path.join(OUT, "report.txt"), `${report.join("\n")}\n`);
  console.log(`[fuzz-memory] report, samples and snapshots in ${path.relative(ROOT, OUT)}`);
  process.exit(code ?? 1);
});
