// Reads a V8 .heapsnapshot (node --heapsnapshot-signal, or writeHeapSnapshot) without loading it
// as one JSON value, which a snapshot of a large heap is too big for: the numbers of "nodes" are
// scanned straight from the bytes and each of "strings" is parsed on its own. Dependency-free,
// for scripts/fuzz-memory.mjs.
import fs from "node:fs";

/** The numbers of the array that follows `"key":[`, from `from` on; returns them and where it ended. */
function numbersAfter(buf, key, from = 0) {
  const at = buf.indexOf(`"${key}":[`, from);
  if (at < 0) throw new Error(`no "${key}" in the snapshot`);
  let i = at + key.length + 4;
  let out = new Float64Array(1 << 20);
  let n = 0;
  let value = 0;
  let inNumber = false;
  for (; i < buf.length; i++) {
    const c = buf[i];
    if (c >= 48 && c <= 57) {
      value = value * 10 + (c - 48);
      inNumber = true;
      continue;
    }
    if (inNumber) {
      if (n === out.length) {
        const bigger = new Float64Array(out.length * 2);
        bigger.set(out);
        out = bigger;
      }
      out[n++] = value;
      value = 0;
      inNumber = false;
    }
    if (c === 93) break; // "]"
  }
  return { values: out.subarray(0, n), end: i };
}

/** The "strings" array: each JSON string literal parsed on its own. */
function stringsAfter(buf, from) {
  const at = buf.indexOf('"strings":[', from);
  if (at < 0) throw new Error('no "strings" in the snapshot');
  const out = [];
  let i = at + 11;
  while (i < buf.length) {
    const c = buf[i];
    if (c === 93) break;
    if (c !== 34) {
      i++;
      continue;
    }
    let j = i + 1;
    while (j < buf.length && buf[j] !== 34) j += buf[j] === 92 ? 2 : 1;
    out.push(JSON.parse(buf.toString("utf8", i, j + 1)));
    i = j + 1;
  }
  return out;
}

function load(file) {
  const buf = fs.readFileSync(file);
  const metaEnd = buf.indexOf('"nodes":[');
  const meta = JSON.parse(`${buf.toString("utf8", 0, metaEnd).replace(/,\s*$/, "")}}`).snapshot.meta;
  const nodes = numbersAfter(buf, "nodes", metaEnd - 1);
  return { buf, meta, nodes: nodes.values, end: nodes.end };
}

/** The group a node counts in (see `summarise`). */
function groupOf(type, name) {
  if (type === "object") return name;
  if (type === "string" || type === "concatenated string" || type === "sliced string") return "(string)";
  if (type === "native" || type === "hidden" || type === "closure" || type === "array") return `(${type}) ${name.replace(/\d+/g, "#").slice(0, 60)}`;
  return `(${type})`;
}

/**
 * Who holds the biggest objects of `group`: for a few of them, the chain of retainers up to a
 * root (weak edges skipped), e.g. "Map ← table (closure) ← …". Reads the edges too.
 */
export function retainers(file, group, { samples = 3, depth = 10 } = {}) {
  const { buf, meta, nodes, end } = load(file);
  const width = meta.node_fields.length;
  const types = meta.node_types[0];
  const edgeTypes = meta.edge_types[0];
  const [TYPE, NAME, SIZE, EDGES] = ["type", "name", "self_size", "edge_count"].map((f) => meta.node_fields.indexOf(f));
  const { values: edges, end: edgesEnd } = numbersAfter(buf, "edges", end);
  const strings = stringsAfter(buf, edgesEnd);
  const ew = meta.edge_fields.length;
  const count = nodes.length / width;
  // Reverse index: for each node, the edges that point at it (edge index, from node).
  const firstIn = new Int32Array(count + 1);
  for (let e = 0; e < edges.length; e += ew) firstIn[edges[e + 2] / width + 1]++;
  for (let i = 0; i < count; i++) firstIn[i + 1] += firstIn[i];
  const inFrom = new Int32Array(edges.length / ew);
  const inEdge = new Int32Array(edges.length / ew);
  const fill = firstIn.slice();
  for (let n = 0, e = 0; n < count; n++) {
    for (let k = 0; k < nodes[n * width + EDGES]; k++, e += ew) {
      const to = edges[e + 2] / width;
      inFrom[fill[to]] = n;
      inEdge[fill[to]++] = e;
    }
  }
  const label = (n) => `${strings[nodes[n * width + NAME]]?.slice(0, 40) ?? "?"} (${types[nodes[n * width + TYPE]]})`;
  const picks = [];
  for (let n = 0; n < count; n++) {
    if (groupOf(types[nodes[n * width + TYPE]], strings[nodes[n * width + NAME]] ?? "") === group) picks.push(n);
  }
  picks.sort((a, b) => nodes[b * width + SIZE] - nodes[a * width + SIZE]);
  return picks.slice(0, samples).map((start) => {
    const chain = [label(start)];
    const seen = new Set([start]);
    let n = start;
    for (let d = 0; d < depth; d++) {
      let next = -1;
      for (let i = firstIn[n]; i < firstIn[n + 1]; i++) {
        const kind = edgeTypes[edges[inEdge[i]]];
        if (kind === "weak" || seen.has(inFrom[i])) continue;
        const name = kind === "element" || kind === "hidden" ? `[${edges[inEdge[i] + 1]}]` : strings[edges[inEdge[i] + 1]];
        chain.push(`${String(name).slice(0, 30)} of ${label(inFrom[i])}`);
        next = inFrom[i];
        break;
      }
      if (next < 0) break;
      seen.add(next);
      n = next;
    }
    return chain.join(" ← ");
  });
}

/**
 * Self size and count per kind of object: constructor name for objects, "(string)", "(array)",
 * "(compiled code)", "(closure) name", "(system) name", and native memory as V8 names it.
 * Also the total, and the largest strings with their first characters.
 */
export function summarise(file) {
  const { buf, meta, nodes, end } = load(file);
  const fields = meta.node_fields;
  const types = meta.node_types[0];
  const width = fields.length;
  const [TYPE, NAME, SIZE] = ["type", "name", "self_size"].map((f) => fields.indexOf(f));
  const strings = stringsAfter(buf, numbersAfter(buf, "edges", end).end);
  const groups = new Map();
  const bigStrings = [];
  let total = 0;
  for (let i = 0; i < nodes.length; i += width) {
    const type = types[nodes[i + TYPE]];
    const name = strings[nodes[i + NAME]] ?? "";
    const size = nodes[i + SIZE];
    total += size;
    const key = groupOf(type, name);
    if (key === "(string)" && size > 64 * 1024) bigStrings.push({ size, start: name.slice(0, 80) });
    const g = groups.get(key) ?? { size: 0, count: 0 };
    g.size += size;
    g.count += 1;
    groups.set(key, g);
  }
  bigStrings.sort((a, b) => b.size - a.size);
  return { total, nodes: nodes.length / width, groups, bigStrings: bigStrings.slice(0, 10) };
}

const mib = (n) => `${(n / 1024 / 1024).toFixed(1)} MiB`;

/** Lines comparing two summaries: what grew most between them. */
export function compare(label, before, after, top = 20) {
  const keys = new Set([...before.groups.keys(), ...after.groups.keys()]);
  const rows = [...keys].map((k) => {
    const a = before.groups.get(k) ?? { size: 0, count: 0 };
    const b = after.groups.get(k) ?? { size: 0, count: 0 };
    return { k, grew: b.size - a.size, count: b.count - a.count, size: b.size };
  });
  rows.sort((x, y) => Math.abs(y.grew) - Math.abs(x.grew));
  const lines = [`${label}: heap ${mib(before.total)} → ${mib(after.total)} (${after.total >= before.total ? "+" : ""}${mib(after.total - before.total)})`];
  for (const r of rows.slice(0, top)) lines.push(`  ${r.grew >= 0 ? "+" : ""}${mib(r.grew).padStart(10)}  ${String(r.count >= 0 ? `+${r.count}` : r.count).padStart(9)} objects  now ${mib(r.size).padStart(9)}  ${r.k}`);
  return lines;
}
