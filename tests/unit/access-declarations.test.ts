import { describe, expect, it } from "vitest";
import { declarationId, routeOf, scanActionSource, scanDeclarations, scanRouteSource } from "../support/declarations";
import { schemaFields } from "../support/schema-fields";

// The generated access test (tests/e2e/access-generated.spec.ts) calls whatever this parser finds.
// If a parsing regression made it find nothing, that test would pass having called nothing: these
// checks keep the parser honest on the real tree and on small sources of each shape.

describe("the declaration parser on the app", () => {
  const scan = scanDeclarations();
  const byId = new Map([...scan.handlers, ...scan.actions].map((d) => [declarationId(d), d]));

  it("finds every handler method and server action there is (at least as many as when the test was written)", () => {
    // 36 handler methods made with route() and 44 actions with formAction() on 2026-12-04.
    expect(scan.handlers.length).toBeGreaterThanOrEqual(36);
    expect(scan.actions.length).toBeGreaterThanOrEqual(44);
  });

  it("reads permission, resource, params, body and cross-site from real declarations", () => {
    // `const params = z.object(...)` shared by PATCH and DELETE, a JSON body.
    expect(byId.get("PATCH /api/jobs/[job]/entries/[entry]")).toMatchObject({ permission: "journal:post", resource: "job", params: ["job", "entry"], body: "json", crossSite: false });
    expect(byId.get("POST /api/jobs/[job]/photos")).toMatchObject({ body: "multipart", resource: "job" });
    expect(byId.get("POST /api/webhooks/video")).toMatchObject({ permission: "public", resource: null, body: "raw", crossSite: true });
    expect(byId.get("GET /api/shops/[shop]/jobs")).toMatchObject({ permission: "shop:view-board", resource: "shop", query: true });
    // Route groups leave the address.
    expect(byId.get("GET /s/[shop]/logo")).toMatchObject({ permission: "public", params: ["shop"] });
    // `{ input, ...draft }` with `const draft = { resource, permission } as const`.
    expect(byId.get("app/(staff)/shop/[shop]/jobs/[number]/invoice/actions.ts#issueInvoiceAction")).toMatchObject({ resource: "invoice", permission: "invoice:create" });
    expect(byId.get("app/(auth)/sign-in/actions.ts#signOutEverywhereAction")).toMatchObject({ permission: "signed-in", resource: null });
  });

  it("leaves out only next-auth's own route file", () => {
    expect([...byId.keys()].some((id) => id.includes("nextauth"))).toBe(false);
  });
});

describe("the declaration parser on small sources", () => {
  it("turns a file path into its address", () => {
    expect(routeOf("app/(public)/s/[shop]/[story]/photos/[photo]/[size]/route.ts")).toBe("/s/[shop]/[story]/photos/[photo]/[size]");
  });

  it("reports a handler not made with route(), a plain function export, and params that don't match the path", () => {
    const { handlers, problems } = scanRouteSource(
      "app/api/things/[thing]/route.ts",
      `import { route } from "@/lib/route";
       export const dynamic = "force-dynamic";
       export const GET = route({ params: z.object({ thing: ids.row }), resource: "job", permission: "job:view" }, run);
       export const POST = somethingElse({ permission: "public" }, run);
       export async function PUT() {}
       export const PATCH = route({ params: z.object({ other: ids.row }), permission: "public" }, run);
       export const DELETE = route({ params: z.object({ thing: ids.row }), permission: pick() }, run);`,
    );
    expect(handlers.map((h) => `${h.method} ${h.permission} ${h.resource}`)).toEqual(["GET job:view job"]);
    expect(problems).toHaveLength(4);
    expect(problems.join("\n")).toMatch(/POST is not made with route/);
    expect(problems.join("\n")).toMatch(/FunctionDeclaration is not made with route/);
    expect(problems.join("\n")).toMatch(/PATCH: params \[other\] don't match the path's \[thing\]/);
    expect(problems.join("\n")).toMatch(/DELETE: permission is not a string literal/);
  });

  it("reports an action not made with formAction(), and an inline \"use server\" function elsewhere", () => {
    const actions = scanActionSource(
      "app/x/actions.ts",
      `"use server";
       export type State = { ok: boolean };
       export const good = formAction({ input: schema, resource: "shop", permission: "specs:manage" }, run);
       export async function bad(form: FormData) {}`,
    );
    expect(actions.actions.map((a) => a.name)).toEqual(["good"]);
    expect(actions.problems).toEqual([expect.stringMatching(/FunctionDeclaration is not made with formAction/)]);

    const page = scanActionSource("app/x/page.tsx", `export default function Page() { async function go() { "use server"; } return null; }`);
    expect(page.actions).toEqual([]);
    expect(page.problems).toEqual([expect.stringMatching(/inline "use server"/)]);
  });

  it("ignores modules that aren't \"use server\"", () => {
    expect(scanActionSource("app/x/helpers.ts", `export const x = 1; export function y() {}`)).toEqual({ handlers: [], actions: [], problems: [] });
  });
});

describe("schemas the fuzz test reads", () => {
  // tests/e2e/fuzz.spec.ts puts wrong values into every field of every action; it reads the field
  // names from the source and stops on a schema it can't read (keys computed at run time).
  // Finding that here costs a second, not an end-to-end run.
  it("every server action's input schema has field names readable from the source", () => {
    const unreadable = scanDeclarations().actions.filter((d) => schemaFields(d) === null).map((d) => `${d.file}#${d.name}`);
    expect(unreadable).toEqual([]);
  });
});
