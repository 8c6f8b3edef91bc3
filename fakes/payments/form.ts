// Form bodies with bracket keys, as the `stripe` SDK sends them:
// `line_items[0][price_data][currency]=usd&metadata[invoice]=7` → { line_items: [{ price_data: { currency: "usd" } }], metadata: { invoice: "7" } }.
// The `qs` package isn't installed here, and this is all the fake needs: values stay strings.
import { invalidRequest } from "./errors";

export type FormValue = string | FormValue[] | { [key: string]: FormValue };
export type FormObject = { [key: string]: FormValue };

const MAX_PAIRS = 1000;
const MAX_DEPTH = 8;
// Keys that would reach Object.prototype if a parser were careless.
const FORBIDDEN = new Set(["__proto__", "prototype", "constructor"]);

function splitKey(key: string): string[] {
  const m = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(key);
  if (!m) throw invalidRequest(`Invalid parameter name "${key}".`, key);
  const parts = [m[1]!, ...[...m[2]!.matchAll(/\[([^[\]]*)\]/g)].map((x) => x[1]!)];
  if (parts.length > MAX_DEPTH) throw invalidRequest(`Parameter "${key}" is nested too deeply.`, key);
  if (parts.some((p) => FORBIDDEN.has(p))) throw invalidRequest(`Invalid parameter name "${key}".`, key);
  return parts;
}

/** Objects whose keys are exactly 0..n-1 become arrays (how the SDK writes lists). */
function listify(value: FormValue): FormValue {
  if (typeof value === "string" || Array.isArray(value)) return value;
  const keys = Object.keys(value);
  const children = Object.fromEntries(keys.map((k) => [k, listify(value[k]!)]));
  const isList = keys.length > 0 && keys.every((k, i) => k === String(i));
  return isList ? keys.map((k) => children[k]!) : children;
}

export function parseForm(text: string): FormObject {
  const params = new URLSearchParams(text);
  const root: { [key: string]: FormValue } = Object.create(null);
  let count = 0;
  for (const [key, value] of params) {
    if (++count > MAX_PAIRS) throw invalidRequest(`At most ${MAX_PAIRS} parameters per request.`);
    const parts = splitKey(key);
    let node: { [key: string]: FormValue } = root;
    for (let i = 0; i < parts.length; i++) {
      // `a[]=x` appends: number it after what is there.
      const part = parts[i] === "" ? String(Object.keys(node).length) : parts[i]!;
      if (i === parts.length - 1) {
        node[part] = value;
        break;
      }
      const next = node[part];
      if (typeof next === "string" || Array.isArray(next)) throw invalidRequest(`Parameter "${key}" mixes a value and nested fields.`, key);
      node = (node[part] ??= Object.create(null) as { [key: string]: FormValue }) as { [key: string]: FormValue };
    }
  }
  return Object.fromEntries(Object.entries(root).map(([k, v]) => [k, listify(v)]));
}

// ---- reading typed fields out of a parsed form ---------------------------------------------------

export function str(form: FormObject, key: string, opts: { required?: boolean; max?: number; path?: string } = {}): string | undefined {
  const name = opts.path ?? key;
  const v = form[key];
  if (v === undefined || v === "") {
    if (opts.required) throw invalidRequest(`Missing required param: ${name}.`, name);
    return undefined;
  }
  if (typeof v !== "string") throw invalidRequest(`Invalid string: ${name} must be a single value.`, name);
  if (opts.max && v.length > opts.max) throw invalidRequest(`${name} is longer than ${opts.max} characters.`, name);
  return v;
}

export function int(form: FormObject, key: string, opts: { required?: boolean; min?: number; path?: string } = {}): number | undefined {
  const name = opts.path ?? key;
  const v = str(form, key, { required: opts.required, path: name });
  if (v === undefined) return undefined;
  if (!/^-?\d{1,15}$/.test(v)) throw invalidRequest(`Invalid integer: ${v}`, name);
  const n = Number(v);
  if (opts.min !== undefined && n < opts.min) throw invalidRequest(`${name} must be at least ${opts.min}.`, name);
  return n;
}

export function obj(form: FormObject, key: string, path = key): FormObject | undefined {
  const v = form[key];
  if (v === undefined || v === "") return undefined;
  if (typeof v !== "object" || Array.isArray(v)) throw invalidRequest(`Invalid object: ${path}.`, path);
  return v;
}

export function list(form: FormObject, key: string): FormObject[] | undefined {
  const v = form[key];
  if (v === undefined || v === "") return undefined;
  if (!Array.isArray(v) || v.some((x) => typeof x !== "object" || Array.isArray(x))) throw invalidRequest(`Invalid array: ${key}.`, key);
  return v as FormObject[];
}

/** Metadata: up to 50 string pairs, keys up to 40 characters, values up to 500. An empty value removes a key. */
export function metadata(form: FormObject, key = "metadata"): Record<string, string> {
  const m = obj(form, key);
  if (!m) return {};
  const entries = Object.entries(m);
  if (entries.length > 50) throw invalidRequest(`${key} can have at most 50 keys.`, key);
  const out: Record<string, string> = {};
  for (const [k, v] of entries) {
    if (typeof v !== "string") throw invalidRequest(`${key}[${k}] must be a string.`, `${key}[${k}]`);
    if (k.length > 40 || v.length > 500) throw invalidRequest(`${key}[${k}]: keys up to 40 characters, values up to 500.`, `${key}[${k}]`);
    if (v !== "") out[k] = v;
  }
  return out;
}
