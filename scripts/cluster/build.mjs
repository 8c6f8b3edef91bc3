// The cluster's production build in its own folder (.next-cluster, without the type check:
// next.config.mjs), made again only when the sources it is built from changed since.
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { ROOT } from "../lib/setup.mjs";

export const DIST = ".next-cluster";
const STAMP = "cluster-sources.sha256";

// What a build doesn't read: tests, orchestration, the fakes, data, other builds, docs.
const SKIP = new Set(["node_modules", ".git", ".data", "tests", "scripts", "fakes", "test-results", "playwright-report", "docs"]);

function* files(dir) {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    if (SKIP.has(entry.name) || entry.name.startsWith(".next")) continue;
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) yield* files(full);
    else if (entry.isFile() && !entry.name.endsWith(".md")) yield full;
  }
}

/**
 * The files a build reads: what git tracks or would track (so what a build writes into the tree,
 * ignored files such as public/sw/, doesn't make the next run build again), else a walk.
 */
function sourceFiles(root) {
  const listed = spawnSync("git", ["ls-files", "-z", "--cached", "--others", "--exclude-standard"], { cwd: root, encoding: "utf8" });
  if (listed.status !== 0) return [...files(root)];
  // scripts/ is skipped, but not what next.config.mjs itself imports from it (the service worker's builder).
  const config = fs.readFileSync(path.join(root, "next.config.mjs"), "utf8");
  const imported = new Set([...config.matchAll(/from\s+"\.\/(scripts\/[^"]+)"/g)].map((m) => m[1]));
  return listed.stdout
    .split("\0")
    .filter((f) => f && !f.endsWith(".md") && (imported.has(f) || !SKIP.has(f.split("/")[0])))
    .map((f) => path.join(root, f))
    .filter((f) => fs.existsSync(f));
}

/** A digest of every source file's path, size and modification time (cheap; a touched file counts as changed). */
export function sourcesDigest(root = ROOT) {
  const hash = crypto.createHash("sha256");
  for (const file of sourceFiles(root).sort()) {
    const info = fs.statSync(file);
    hash.update(`${path.relative(root, file)}\0${info.size}\0${info.mtimeMs}\n`);
  }
  return hash.digest("hex");
}

const stampFile = () => path.join(ROOT, DIST, STAMP);

/** True when .next-cluster holds a finished build of the sources as they are now. */
export function buildIsCurrent(digest) {
  try {
    return fs.existsSync(path.join(ROOT, DIST, "BUILD_ID")) && fs.readFileSync(stampFile(), "utf8").trim() === digest;
  } catch {
    return false;
  }
}

/** Remembers which sources the finished build was made from (the digest taken before it started). */
export function markBuilt(digest) {
  fs.writeFileSync(stampFile(), `${digest}\n`);
}
