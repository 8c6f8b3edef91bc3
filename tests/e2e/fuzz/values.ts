// The malformed pieces the fuzz test (tests/e2e/fuzz.spec.ts) builds its requests from, drawn
// from a seeded generator so a run is repeated exactly by its seed. Nothing here is valid on
// purpose; whether a whole request is harmless is decided where it is put together (cases.ts).

/** sfc32: small, fast, and the same sequence for the same seed on every platform. */
export class Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;
  constructor(seed: number) {
    this.a = 0x9e3779b9;
    this.b = 0x243f6a88;
    this.c = 0xb7e15162;
    this.d = seed >>> 0;
    for (let i = 0; i < 16; i++) this.next();
  }
  next(): number {
    const t = (((this.a + this.b) | 0) + this.d) | 0;
    this.d = (this.d + 1) | 0;
    this.a = this.b ^ (this.b >>> 9);
    this.b = (this.c + (this.c << 3)) | 0;
    this.c = (this.c << 21) | (this.c >>> 11);
    this.c = (this.c + t) | 0;
    return (t >>> 0) / 4294967296;
  }
  int(n: number): number {
    return Math.floor(this.next() * n);
  }
  pick<T>(items: readonly T[]): T {
    return items[this.int(items.length)]!;
  }
  chance(p: number): boolean {
    return this.next() < p;
  }
  string(length: number, alphabet = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789_-"): string {
    let s = "";
    for (let i = 0; i < length; i++) s += alphabet[this.int(alphabet.length)];
    return s;
  }
}

/** %-escapes a path segment can't be decoded from: Next itself would answer a bare 500. */
export const BAD_ESCAPES = ["%ZZ", "%FF", "%C0%AE", "%C0%80", "%E0%80%AF", "%ED%A0%80", "%F0%9F", "%F8%88%80%80%80", "%", "%2", "%G1", "%u0041", "abc%", "%%", "%C3", "%C3%28"];

/** Text that is valid UTF-8 but no id: overlong, unicode, dot segments, encoded slashes, look-alikes. */
export function oddSegment(rng: Rng): string {
  const choices: (() => string)[] = [
    () => "9".repeat(16 + rng.int(40)),
    () => rng.string(100 + rng.int(4000)),
    () => encodeURIComponent("🔧".repeat(1 + rng.int(20))),
    () => encodeURIComponent("\u202eJ-0001\u0000"),
    () => encodeURIComponent("ÄÖÜ-ид-工作"),
    () => rng.pick(["%2e%2e", "%2E", "..%2F..%2Fetc%2Fpasswd", "%2F", "%5C", "%00", "%0A", "%20", "%09"]),
    () => rng.pick(["-1", "0", "1e308", "NaN", "Infinity", "null", "undefined", "true", "[]", "{}", "0x10", "1.5", "-0", "9007199254740993"]),
    () => encodeURIComponent(rng.pick(["<script>alert(1)</script>", "' OR 1=1 --", "${7*7}", "{{7*7}}", "__proto__", "constructor", "J-0001"])),
    () => rng.string(15) + rng.pick(["!", "*", "'", "(", "~", "."]),
  ];
  return rng.pick(choices)();
}

/** A well-formed but malformed-escaped segment: a bad escape somewhere in something id-like. */
export function badEscapeSegment(rng: Rng, like: string): string {
  const at = rng.int(like.length + 1);
  return like.slice(0, at) + rng.pick(BAD_ESCAPES) + like.slice(at);
}

/** Values of the wrong type (or an absurd one) for a JSON field. */
export function wrongJsonValue(rng: Rng, depth = 0): unknown {
  const choices: (() => unknown)[] = [
    () => null,
    () => rng.pick([true, false]),
    () => rng.pick([-1, 0, -0, 1.5, 1e308, -1e308, 2 ** 53 + 1, 5e-324, 2147483648, -2147483649]),
    () => "",
    () => rng.pick(["NaN", "Infinity", "-1", "1e308", "0x1F", " ", "\u0000", "null", "true"]),
    () => "x".repeat(rng.chance(0.1) ? 50_000 + rng.int(100_000) : 500 + rng.int(5000)),
    () => rng.pick(["🔧".repeat(100), "\u202e\u200f", "\ud800", "é\u0301", "<b>x</b>"]),
    () => [],
    () => ({}),
    () => (depth < 3 ? [wrongJsonValue(rng, depth + 1), wrongJsonValue(rng, depth + 1)] : []),
    () => (depth < 3 ? { type: wrongJsonValue(rng, depth + 1), content: [wrongJsonValue(rng, depth + 1)] } : {}),
    () => Array.from({ length: 200 + rng.int(2000) }, () => 1),
  ];
  return rng.pick(choices)();
}

/** Values of the wrong kind for a form field (everything in a form is text, or a file). */
export function wrongFormValue(rng: Rng): string {
  return rng.pick<() => string>([
    () => "",
    () => " ",
    () => rng.pick(["NaN", "Infinity", "-Infinity", "-1", "0", "-0", "1e308", "1e-400", "0x10", "1,5", "12abc", "9".repeat(40), "2147483648", "9007199254740993"]),
    () => rng.pick(["true", "false", "null", "undefined", "[]", "{}", '{"a":1}', "on", "yes"]),
    () => "x".repeat(rng.chance(0.1) ? 100_000 + rng.int(300_000) : 200 + rng.int(5000)),
    () => rng.pick(["🔧".repeat(500), "\u0000", "\u202e\u200f", "\ud800", "a\r\nb", "<script>x</script>", "' OR 1=1 --"]),
    () => rng.pick(["1999-02-30", "0000-00-00", "99999-01-01", "2026-13-45", "yesterday", "2026-12-04T25:61:00Z"]),
    () => rng.string(1 + rng.int(64), "abcdefghijklmnopqrstuvwxyz0123456789@.-_ "),
  ])();
}

/** JSON texts a JSON body must be refused for: not JSON, cut short, or not an object. */
export function brokenJsonText(rng: Rng, sample: string): string {
  return rng.pick<() => string>([
    () => "",
    () => "   \n",
    () => sample.slice(0, Math.max(1, rng.int(sample.length))),
    () => rng.pick(["{'a':1}", "{a:1}", '{"a":1,}', "[1,2,,]", "NaN", "Infinity", "undefined", '{"a":NaN}', '{"a":1e999999}', "{", "}", '"', "\\u0000", '{"a":"\\ud800"'] as const),
    () => rng.pick(["[]", "null", "42", '"text"', "true", "[{}]", "-0", "1e308"]),
    () => "[".repeat(5000 + rng.int(50_000)) + "]".repeat(rng.int(2) ? 0 : 100),
    () => '{"a":'.repeat(2000) + "1" + "}".repeat(2000),
    () => "\ufeff" + sample,
  ])();
}

/** A multipart body with the given fields (text or file), as a browser would frame it. */
export function multipart(fields: [string, string | { file: string; type: string; data: Buffer }][], boundary: string): Buffer {
  const parts: Buffer[] = [];
  for (const [name, value] of fields) {
    const head =
      typeof value === "string"
        ? `--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n`
        : `--${boundary}\r\nContent-Disposition: form-data; name="${name}"; filename="${value.file}"\r\nContent-Type: ${value.type}\r\n\r\n`;
    parts.push(Buffer.from(head), typeof value === "string" ? Buffer.from(value) : value.data, Buffer.from("\r\n"));
  }
  parts.push(Buffer.from(`--${boundary}--\r\n`));
  return Buffer.concat(parts);
}

/** Framing mistakes in a multipart body that are still sent with a correct length. */
export function brokenMultipart(rng: Rng, body: Buffer, boundary: string): Buffer {
  return rng.pick<() => Buffer>([
    () => body.subarray(0, 1 + rng.int(Math.max(1, body.length - 2))),
    () => Buffer.from(body.toString("latin1").replaceAll(boundary, boundary.slice(0, -1) + "X"), "latin1"),
    () => Buffer.from(body.toString("latin1").replace(/\r\n/g, "\n"), "latin1"),
    () => Buffer.from(`--${boundary}\r\nContent-Disposition: form-data\r\n\r\nno name\r\n--${boundary}--\r\n`),
    () => Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="0"\r\n\r\n` + "x".repeat(rng.int(100))),
    () => Buffer.alloc(1 + rng.int(4096), rng.int(256)),
  ])();
}
