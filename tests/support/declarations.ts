// Reads what every route handler and server action declares (lib/route.ts, lib/action.ts) from
// the source, with the TypeScript compiler: no app code runs. The generated access test
// (tests/e2e/access-generated.spec.ts) calls each one; anything that isn't made with route() /
// formAction(), or whose declaration can't be read, is a problem the test fails on.
// Shared by Vitest and Playwright, so no test-runner imports.
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";

export type BodyKind = "none" | "json" | "multipart" | "raw";

type Common = {
  /** Repository-relative path, forward slashes. */
  file: string;
  permission: string;
  resource: string | null;
};

export type HandlerDeclaration = Common & {
  kind: "handler";
  method: string;
  /** The URL pattern, dynamic segments as in the folder names: "/api/jobs/[job]/entries". */
  route: string;
  params: string[];
  query: boolean;
  body: BodyKind;
  /** What the JSON body's schema is built from (see schemaRoot); null for none or an inline z.object. */
  bodySchema: string | null;
  crossSite: boolean;
};

/** `schema`: the identifier the input schema is built from (see schemaRoot), null for an inline z.object. */
export type ActionDeclaration = Common & { kind: "action"; name: string; schema: string | null };

export type Declaration = HandlerDeclaration | ActionDeclaration;

export type DeclarationScan = { handlers: HandlerDeclaration[]; actions: ActionDeclaration[]; problems: string[] };

/** Route files that aren't ours to wrap, each with the reason. */
export const EXEMPT_ROUTE_FILES: Record<string, string> = {
  "app/api/auth/[...nextauth]/route.ts": "next-auth's own sign-in endpoints (its handlers, not a route() of ours)",
};

const HTTP_METHODS = new Set(["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"]);
/** Route segment config a route.ts may export besides its methods. */
const SEGMENT_CONFIG = new Set(["dynamic", "dynamicParams", "revalidate", "fetchCache", "runtime", "preferredRegion", "maxDuration"]);

/** "/api/jobs/[job]/entries" from "app/api/jobs/[job]/entries/route.ts"; route groups "(x)" vanish. */
export function routeOf(file: string): string {
  const segments = file.split("/").slice(1, -1).filter((s) => !/^\(.*\)$/.test(s));
  return `/${segments.join("/")}`;
}

function walk(dir: string, out: string[] = []): string[] {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) walk(full, out);
    else if (/\.tsx?$/.test(entry.name)) out.push(full);
  }
  return out;
}

/** Every route.ts and every "use server" module under app/ of the repository at `root`. */
export function scanDeclarations(root = process.cwd()): DeclarationScan {
  const scan: DeclarationScan = { handlers: [], actions: [], problems: [] };
  for (const full of walk(path.join(root, "app")).sort()) {
    const file = path.relative(root, full).split(path.sep).join("/");
    const text = fs.readFileSync(full, "utf8");
    const part = path.basename(file) === "route.ts" ? scanRouteSource(file, text) : scanActionSource(file, text);
    scan.handlers.push(...part.handlers);
    scan.actions.push(...part.actions);
    scan.problems.push(...part.problems);
  }
  return scan;
}

export const parse = (file: string, text: string) => ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true, file.endsWith("x") ? ts.ScriptKind.TSX : ts.ScriptKind.TS);

const hasExport = (node: ts.Node) => ts.canHaveModifiers(node) && !!ts.getModifiers(node)?.some((m) => m.kind === ts.SyntaxKind.ExportKeyword);

function isUseServer(statement: ts.Statement | undefined): boolean {
  return !!statement && ts.isExpressionStatement(statement) && ts.isStringLiteral(statement.expression) && statement.expression.text === "use server";
}

/** Top-level `const` initialisers, so `{ params, ...draft }` can be followed to what they name. */
export function constants(source: ts.SourceFile): Map<string, ts.Expression> {
  const found = new Map<string, ts.Expression>();
  for (const statement of source.statements) {
    if (!ts.isVariableStatement(statement)) continue;
    for (const d of statement.declarationList.declarations) if (ts.isIdentifier(d.name) && d.initializer) found.set(d.name.text, d.initializer);
  }
  return found;
}

/** `x as const`, `(x)`, `x satisfies T` → x. */
export function strip(e: ts.Expression): ts.Expression {
  while (ts.isAsExpression(e) || ts.isParenthesizedExpression(e) || ts.isSatisfiesExpression(e)) e = e.expression;
  return e;
}

export class Unreadable extends Error {}

export function resolveConst(e: ts.Expression, consts: Map<string, ts.Expression>, depth = 0): ts.Expression {
  e = strip(e);
  if (ts.isIdentifier(e) && consts.has(e.text) && depth < 5) return resolveConst(consts.get(e.text)!, consts, depth + 1);
  return e;
}

function stringOf(e: ts.Expression, consts: Map<string, ts.Expression>, what: string): string {
  const v = resolveConst(e, consts);
  if (ts.isStringLiteral(v) || ts.isNoSubstitutionTemplateLiteral(v)) return v.text;
  throw new Unreadable(`${what} is not a string literal`);
}

/** Keys of `z.object({...})`, of `const x = z.object(...)`, or of `x.extend({...})`. */
function objectSchemaKeys(e: ts.Expression, consts: Map<string, ts.Expression>): string[] {
  const v = resolveConst(e, consts);
  if (ts.isCallExpression(v) && ts.isPropertyAccessExpression(v.expression)) {
    const method = v.expression.name.text;
    const literal = v.arguments[0] && strip(v.arguments[0]);
    const own = literal && ts.isObjectLiteralExpression(literal) ? literal.properties.map((p) => (p.name && (ts.isIdentifier(p.name) || ts.isStringLiteral(p.name)) ? p.name.text : "?")) : null;
    if (method === "object" && own) return own;
    if (method === "extend" && own) return [...objectSchemaKeys(v.expression.expression, consts), ...own];
  }
  throw new Unreadable("params is not a z.object({...}) the test can read");
}

/** The properties of the declaration object, spreads of local constants included. */
export function declarationProperties(arg: ts.Expression | undefined, consts: Map<string, ts.Expression>): Map<string, ts.Expression> {
  const literal = arg && resolveConst(arg, consts);
  if (!literal || !ts.isObjectLiteralExpression(literal)) throw new Unreadable("the declaration is not an object literal");
  const props = new Map<string, ts.Expression>();
  for (const p of literal.properties) {
    if (ts.isPropertyAssignment(p) && (ts.isIdentifier(p.name) || ts.isStringLiteral(p.name))) props.set(p.name.text, p.initializer);
    else if (ts.isShorthandPropertyAssignment(p)) props.set(p.name.text, p.name);
    else if (ts.isSpreadAssignment(p)) for (const [k, v] of declarationProperties(p.expression, consts)) props.set(k, v);
    else throw new Unreadable("the declaration has a property the test can't read");
  }
  return props;
}

function common(file: string, props: Map<string, ts.Expression>, consts: Map<string, ts.Expression>): Common {
  const permission = props.get("permission");
  if (!permission) throw new Unreadable("it declares no permission");
  const resource = props.get("resource");
  return { file, permission: stringOf(permission, consts, "permission"), resource: resource ? stringOf(resource, consts, "resource") : null };
}

/** `export const X = <callee>(decl, run)`: the declaration's argument, or why it isn't one. */
export function wrapperCall(d: ts.VariableDeclaration, callee: string): ts.Expression | undefined | string {
  const init = d.initializer && strip(d.initializer);
  if (!init || !ts.isCallExpression(init) || !ts.isIdentifier(init.expression) || init.expression.text !== callee) return `is not made with ${callee}(...)`;
  return init.arguments[0];
}

/**
 * The identifier a schema expression starts from: "dropoffFields" for
 * `dropoffFields.extend({ job: ids.job })`, "addLineSchema" for `addLineSchema`; null when it is
 * built inline from `z` (or isn't an identifier chain). Lets tests/unit/form-registry.test.ts
 * match a declaration with the form schemas of lib/schemas/form-fields.ts.
 */
export function schemaRoot(e: ts.Expression | undefined): string | null {
  let v = e && strip(e);
  while (v && (ts.isCallExpression(v) || ts.isPropertyAccessExpression(v))) v = strip(v.expression);
  return v && ts.isIdentifier(v) && v.text !== "z" ? v.text : null;
}

type Part = Omit<DeclarationScan, "problems"> & { problems: string[] };

/** Declarations and problems of one route.ts. */
export function scanRouteSource(file: string, text: string): Part {
  const part: Part = { handlers: [], actions: [], problems: [] };
  if (file in EXEMPT_ROUTE_FILES) return part;
  const source = parse(file, text);
  const consts = constants(source);
  const route = routeOf(file);
  const pathParams = [...route.matchAll(/\[(?:\.\.\.)?([^\]]+)\]/g)].map((m) => m[1]!);
  for (const statement of source.statements) {
    if (ts.isExportDeclaration(statement) || ts.isExportAssignment(statement)) {
      part.problems.push(`${file}: "${statement.getText(source).slice(0, 60)}" — export handlers as \`export const GET = route({...}, run)\``);
      continue;
    }
    if (!hasExport(statement)) continue;
    if (ts.isTypeAliasDeclaration(statement) || ts.isInterfaceDeclaration(statement)) continue;
    if (!ts.isVariableStatement(statement)) {
      part.problems.push(`${file}: an exported ${ts.SyntaxKind[statement.kind]} is not made with route(...)`);
      continue;
    }
    for (const d of statement.declarationList.declarations) {
      const name = ts.isIdentifier(d.name) ? d.name.text : d.name.getText(source);
      if (SEGMENT_CONFIG.has(name)) continue;
      const arg = wrapperCall(d, "route");
      if (typeof arg === "string" || !HTTP_METHODS.has(name)) {
        part.problems.push(`${file}: export ${name} ${typeof arg === "string" ? arg : "is not an HTTP method"}`);
        continue;
      }
      try {
        const props = declarationProperties(arg, consts);
        const params = props.get("params") ? objectSchemaKeys(props.get("params")!, consts) : [];
        if ([...params].sort().join() !== [...pathParams].sort().join()) throw new Unreadable(`params [${params}] don't match the path's [${pathParams}]`);
        const body = props.get("body");
        const bodyKind: BodyKind = !body ? "none" : ts.isStringLiteral(strip(body)) ? (stringOf(body, consts, "body") as BodyKind) : "json";
        const crossSite = props.get("crossSite");
        part.handlers.push({
          kind: "handler",
          method: name,
          route,
          params,
          query: props.has("query"),
          body: bodyKind,
          bodySchema: bodyKind === "json" ? schemaRoot(body) : null,
          crossSite: !!crossSite && stringOf(crossSite, consts, "crossSite") === "allow",
          ...common(file, props, consts),
        });
      } catch (error) {
        if (!(error instanceof Unreadable)) throw error;
        part.problems.push(`${file}: ${name}: ${error.message}`);
      }
    }
  }
  return part;
}

/** Declarations and problems of any other module under app/: only "use server" modules declare actions. */
export function scanActionSource(file: string, text: string): Part {
  const part: Part = { handlers: [], actions: [], problems: [] };
  const source = parse(file, text);
  // A "use server" inside a function body is an inline action no declaration covers.
  const inline = (node: ts.Node): void => {
    if (ts.isBlock(node) && node.parent && ts.isFunctionLike(node.parent) && isUseServer(node.statements[0])) {
      part.problems.push(`${file}: an inline "use server" function — move it to a "use server" module and make it with formAction(...)`);
    }
    ts.forEachChild(node, inline);
  };
  ts.forEachChild(source, inline);
  if (!isUseServer(source.statements[0])) return part;
  const consts = constants(source);
  for (const statement of source.statements) {
    if (ts.isExportDeclaration(statement) && !statement.isTypeOnly) part.problems.push(`${file}: a re-export — declare each action here with formAction(...)`);
    if (ts.isExportAssignment(statement)) part.problems.push(`${file}: a default export is not made with formAction(...)`);
    if (!hasExport(statement) || ts.isTypeAliasDeclaration(statement) || ts.isInterfaceDeclaration(statement)) continue;
    if (!ts.isVariableStatement(statement)) {
      part.problems.push(`${file}: an exported ${ts.SyntaxKind[statement.kind]} is not made with formAction(...)`);
      continue;
    }
    for (const d of statement.declarationList.declarations) {
      const name = ts.isIdentifier(d.name) ? d.name.text : d.name.getText(source);
      const arg = wrapperCall(d, "formAction");
      if (typeof arg === "string") {
        part.problems.push(`${file}: export ${name} ${arg}`);
        continue;
      }
      try {
        const props = declarationProperties(arg, consts);
        if (!props.has("input")) throw new Unreadable("it declares no input schema");
        part.actions.push({ kind: "action", name, schema: schemaRoot(props.get("input")), ...common(file, props, consts) });
      } catch (error) {
        if (!(error instanceof Unreadable)) throw error;
        part.problems.push(`${file}: ${name}: ${error.message}`);
      }
    }
  }
  return part;
}

/** How the test names a declaration in its messages and tables. */
export function declarationId(d: Declaration): string {
  return d.kind === "handler" ? `${d.method} ${d.route}` : `${d.file}#${d.name}`;
}
