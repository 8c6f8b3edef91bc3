// The field names of a declaration's body (route handler) or input (server action) schema, read
// from the source with the declarations' own reader (tests/support/declarations.ts): the fuzz
// test (tests/e2e/fuzz.spec.ts) puts wrong values in every one. It follows local constants and
// `@/…` / relative imports to a `z.object({...})`; `.extend`/`.merge` add keys, `.pick`/`.omit`
// choose, refinements, transforms and modifiers keep them, and a (discriminated) union has the
// keys of all its options. Null when the schema can't be read this way (the fuzz test then has
// only the keys it can learn otherwise). No app code runs.
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";
import { type Declaration, constants, declarationProperties, parse, strip, wrapperCall } from "./declarations";

type Module = { file: string; source: ts.SourceFile; consts: Map<string, ts.Expression>; imports: Map<string, { from: string; name: string }> };

/** Calls that return a schema with the same keys as the one they are called on. */
const KEEPS_KEYS = new Set(["superRefine", "refine", "transform", "loose", "strict", "strip", "passthrough", "describe", "default", "optional", "nullable", "nullish", "catch", "check", "brand", "readonly", "pipe", "meta", "prefault"]);

/** `part`: the handler's "body" (default) or "query"; an action's input either way. */
export function schemaFields(decl: Declaration, part: "body" | "query" = "body", root = process.cwd()): string[] | null {
  const mod = loadModule(path.join(root, decl.file), root);
  if (!mod) return null;
  const exportName = decl.kind === "handler" ? decl.method : decl.name;
  for (const statement of mod.source.statements) {
    if (!ts.isVariableStatement(statement)) continue;
    for (const d of statement.declarationList.declarations) {
      if (!ts.isIdentifier(d.name) || d.name.text !== exportName) continue;
      const arg = wrapperCall(d, decl.kind === "handler" ? "route" : "formAction");
      if (typeof arg === "string" || !arg) return null;
      const schema = declarationProperties(arg, mod.consts).get(decl.kind === "handler" ? part : "input");
      if (!schema || ts.isStringLiteral(strip(schema))) return null;
      const keys = keysOf(schema, mod, root, 0);
      return keys ? [...new Set(keys)] : null;
    }
  }
  return null;
}

const modules = new Map<string, Module | null>();

function loadModule(file: string, root: string): Module | null {
  if (modules.has(file)) return modules.get(file)!;
  let mod: Module | null = null;
  if (fs.existsSync(file)) {
    const source = parse(path.relative(root, file), fs.readFileSync(file, "utf8"));
    const imports = new Map<string, { from: string; name: string }>();
    for (const s of source.statements) {
      if (!ts.isImportDeclaration(s) || !ts.isStringLiteral(s.moduleSpecifier)) continue;
      const bindings = s.importClause?.namedBindings;
      if (!bindings || !ts.isNamedImports(bindings)) continue;
      for (const el of bindings.elements) imports.set(el.name.text, { from: s.moduleSpecifier.text, name: (el.propertyName ?? el.name).text });
    }
    mod = { file, source, consts: constants(source), imports };
  }
  modules.set(file, mod);
  return mod;
}

/** "@/lib/x" or "./x" from `from` → the file, or null for a package. */
function resolveImport(spec: string, from: string, root: string): string | null {
  const base = spec.startsWith("@/") ? path.join(root, spec.slice(2)) : spec.startsWith(".") ? path.resolve(path.dirname(from), spec) : null;
  if (!base) return null;
  return [`${base}.ts`, `${base}.tsx`, path.join(base, "index.ts")].find((f) => fs.existsSync(f)) ?? null;
}

/** The expression an identifier names here or in the module it is imported from. */
function definition(name: string, mod: Module, root: string): { expr: ts.Expression; mod: Module } | null {
  const local = mod.consts.get(name);
  if (local) return { expr: local, mod };
  const imported = mod.imports.get(name);
  const file = imported && resolveImport(imported.from, mod.file, root);
  const other = file ? loadModule(file, root) : null;
  return other && imported ? definition(imported.name, other, root) : null;
}

function literalKeys(e: ts.Expression, mod: Module, root: string, depth: number): string[] | null {
  const v = strip(e);
  if (ts.isIdentifier(v)) {
    const def = definition(v.text, mod, root);
    return def ? literalKeys(def.expr, def.mod, root, depth + 1) : null;
  }
  if (!ts.isObjectLiteralExpression(v)) return keysOf(v, mod, root, depth + 1);
  const keys: string[] = [];
  for (const p of v.properties) {
    if (ts.isSpreadAssignment(p)) {
      const spread = keysOf(p.expression, mod, root, depth + 1);
      if (!spread) return null;
      keys.push(...spread);
    } else if (p.name && (ts.isIdentifier(p.name) || ts.isStringLiteral(p.name))) keys.push(p.name.text);
  }
  return keys;
}

function keysOf(e: ts.Expression, mod: Module, root: string, depth: number): string[] | null {
  if (depth > 12) return null;
  const v = strip(e);
  if (ts.isIdentifier(v)) {
    const def = definition(v.text, mod, root);
    return def ? keysOf(def.expr, def.mod, root, depth + 1) : null;
  }
  // `schema.shape`: the keys of the schema.
  if (ts.isPropertyAccessExpression(v) && v.name.text === "shape") return keysOf(v.expression, mod, root, depth + 1);
  if (!ts.isCallExpression(v) || !ts.isPropertyAccessExpression(v.expression)) return null;
  const method = v.expression.name.text;
  const target = v.expression.expression;
  const [first, second] = v.arguments;
  const isZ = ts.isIdentifier(target) && target.text === "z";
  if (isZ && (method === "object" || method === "strictObject" || method === "looseObject")) return first ? literalKeys(first, mod, root, depth) : [];
  if (isZ && (method === "discriminatedUnion" || method === "union")) {
    const options = method === "union" ? first : second;
    if (!options || !ts.isArrayLiteralExpression(strip(options))) return null;
    const all = (strip(options) as ts.ArrayLiteralExpression).elements.map((o) => keysOf(o, mod, root, depth + 1));
    return all.every((k) => k !== null) ? all.flat() as string[] : null;
  }
  if (isZ) return null;
  const base = keysOf(target, mod, root, depth + 1);
  if (!base) return null;
  if (KEEPS_KEYS.has(method)) return base;
  const own = first ? literalKeys(first, mod, root, depth) : null;
  if (method === "extend" || method === "safeExtend" || method === "merge") return own ? [...base, ...own] : null;
  if (method === "pick") return own;
  if (method === "omit") return own ? base.filter((k) => !own.includes(k)) : null;
  return null;
}
