// Walks the import graph of "use client" modules from the source, with TypeScript's parser: no
// app code runs. What a client module imports at run time ends up in the browser bundle, so a
// package reached from one (zod, say) is bytes every phone downloads. Type-only imports are
// erased by the compiler and "use server" modules become references, so the walk skips both.
// Shared by Vitest and scripts, so no test-runner imports.
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";

const EXTENSIONS = [".ts", ".tsx", "/index.ts", "/index.tsx"];

type Parsed = { directive: "use client" | "use server" | null; imports: string[]; dynamic: string[] };
const cache = new Map<string, Parsed>();

function directiveOf(source: ts.SourceFile): Parsed["directive"] {
  for (const statement of source.statements) {
    if (!ts.isExpressionStatement(statement) || !ts.isStringLiteral(statement.expression)) break;
    const text = statement.expression.text;
    if (text === "use client" || text === "use server") return text;
  }
  return null;
}

/** Run-time imports of a file: static imports and re-exports that aren't type-only; import() calls apart. */
function parse(file: string): Parsed {
  const known = cache.get(file);
  if (known) return known;
  const source = ts.createSourceFile(file, fs.readFileSync(file, "utf8"), ts.ScriptTarget.Latest, true);
  const imports: string[] = [];
  const dynamic: string[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      const clause = node.importClause;
      const typeOnly =
        !!clause &&
        (clause.isTypeOnly ||
          (!clause.name &&
            !!clause.namedBindings &&
            ts.isNamedImports(clause.namedBindings) &&
            clause.namedBindings.elements.length > 0 &&
            clause.namedBindings.elements.every((e) => e.isTypeOnly)));
      if (!typeOnly) imports.push(node.moduleSpecifier.text);
    } else if (ts.isExportDeclaration(node) && node.moduleSpecifier && ts.isStringLiteral(node.moduleSpecifier)) {
      const typeOnly =
        node.isTypeOnly || (!!node.exportClause && ts.isNamedExports(node.exportClause) && node.exportClause.elements.every((e) => e.isTypeOnly));
      if (!typeOnly) imports.push(node.moduleSpecifier.text);
    } else if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword) {
      const [arg] = node.arguments;
      if (arg && ts.isStringLiteral(arg)) dynamic.push(arg.text);
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  const parsed: Parsed = { directive: directiveOf(source), imports, dynamic };
  cache.set(file, parsed);
  return parsed;
}

/** A source file for an import of ours, or null for a package (its name is the specifier). */
function resolveLocal(root: string, from: string, specifier: string): string | null {
  let base: string;
  if (specifier.startsWith("@/")) base = path.join(root, specifier.slice(2));
  else if (specifier.startsWith(".")) base = path.resolve(path.dirname(from), specifier);
  else return null;
  if (/\.(tsx?|mjs|js)$/.test(base) && fs.existsSync(base)) return base;
  for (const ext of EXTENSIONS) if (fs.existsSync(base + ext)) return base + ext;
  return null;
}

/** The package name of a bare specifier: "zod/v4" → "zod", "@mux/mux-player-react/lazy" → "@mux/mux-player-react". */
export function packageName(specifier: string): string {
  const parts = specifier.split("/");
  return specifier.startsWith("@") ? parts.slice(0, 2).join("/") : (parts[0] ?? specifier);
}

/**
 * For one client module: the chain of imports (repository-relative files, then the package)
 * that reaches `pkg`, or null when none does. Stops at "use server" modules. `lazy: false`
 * leaves out import() calls (code split into chunks fetched later): what the page loads first.
 */
export function pathToPackage(root: string, entry: string, pkg: string, { lazy = true }: { lazy?: boolean } = {}): string[] | null {
  const seen = new Set<string>([entry]);
  const queue: string[][] = [[entry]];
  while (queue.length > 0) {
    const chain = queue.shift()!;
    const file = chain[chain.length - 1]!;
    const parsed = parse(file);
    for (const specifier of lazy ? [...parsed.imports, ...parsed.dynamic] : parsed.imports) {
      const local = resolveLocal(root, file, specifier);
      if (!local) {
        if (packageName(specifier) === pkg) return [...chain, specifier].map((f) => (path.isAbsolute(f) ? path.relative(root, f) : f));
        continue;
      }
      if (seen.has(local)) continue;
      seen.add(local);
      if (parse(local).directive === "use server") continue;
      queue.push([...chain, local]);
    }
  }
  return null;
}

/** Every "use client" module under the given folders (repository-relative), sorted. */
export function clientModules(root: string, folders: string[]): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.tsx?$/.test(entry.name) && parse(full).directive === "use client") found.push(full);
    }
  };
  for (const folder of folders) {
    const dir = path.join(root, folder);
    if (fs.existsSync(dir)) walk(dir);
  }
  return found.sort();
}

/**
 * The client modules a page tree hands to the browser: walks the server files from `entries`
 * (pages, layouts, error screens) and collects each "use client" module it reaches, without
 * following past it (what is below is the client walk's business). Repository-relative, sorted.
 */
export function clientBoundaries(root: string, entries: string[]): string[] {
  const boundaries = new Set<string>();
  const seen = new Set<string>();
  const queue = entries.map((e) => path.join(root, e));
  while (queue.length > 0) {
    const file = queue.shift()!;
    if (seen.has(file)) continue;
    seen.add(file);
    const parsed = parse(file);
    if (parsed.directive === "use client") {
      boundaries.add(path.relative(root, file));
      continue;
    }
    for (const specifier of [...parsed.imports, ...parsed.dynamic]) {
      const local = resolveLocal(root, file, specifier);
      if (local && !seen.has(local)) queue.push(local);
    }
  }
  return [...boundaries].sort();
}

/** Every file under `folder` named one of `names` (page.tsx, layout.tsx…), repository-relative. */
export function routeFiles(root: string, folder: string, names: string[]): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (names.includes(entry.name)) found.push(path.relative(root, full));
    }
  };
  walk(path.join(root, folder));
  return found.sort();
}
