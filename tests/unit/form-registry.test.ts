import fs from "node:fs";
import path from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";
import { FORM_FIELDS, NOT_FORMS } from "@/lib/schemas/form-fields";
import { type Declaration, declarationId, parse, scanDeclarations, schemaRoot, strip } from "../support/declarations";

// Issue 16 §7, the other half of tests/unit/form-fields.test.ts: that test checks the forms listed
// in FORM_FIELDS; this one makes sure none is left out. Every server action and every route handler
// that takes a JSON body is either a registered form (its input/body schema is one FORM_FIELDS
// lists) or named in NOT_FORMS with the reason its errors need no field (a button whose only inputs
// the page fills, an upload, a JSON editor with its own banner). Both lists are checked for stale
// lines, so a renamed action or schema can't leave a form silently unchecked.

const scan = scanDeclarations();

function walkTsx(dir: string, out: string[] = []): string[] {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) walkTsx(full, out);
    else if (entry.name.endsWith(".tsx")) out.push(full);
  }
  return out;
}

/** FORM_FIELDS entry → the identifier its `schema:` names, read from the source (the values are zod objects). */
function registeredSchemaNames(): Map<string, string> {
  const file = "lib/schemas/form-fields.ts";
  const source = parse(file, fs.readFileSync(file, "utf8"));
  const out = new Map<string, string>();
  for (const statement of source.statements) {
    if (!ts.isVariableStatement(statement)) continue;
    for (const d of statement.declarationList.declarations) {
      if (!ts.isIdentifier(d.name) || d.name.text !== "FORM_FIELDS" || !d.initializer) continue;
      const literal = strip(d.initializer);
      if (!ts.isObjectLiteralExpression(literal)) throw new Error("FORM_FIELDS is not an object literal");
      for (const p of literal.properties) {
        if (!ts.isPropertyAssignment(p) || !ts.isIdentifier(p.name)) throw new Error(`FORM_FIELDS: unreadable entry ${p.getText(source).slice(0, 40)}`);
        const entry = strip(p.initializer);
        const schema = ts.isObjectLiteralExpression(entry) ? entry.properties.find((q) => q.name?.getText(source) === "schema") : undefined;
        const name = schema && ts.isPropertyAssignment(schema) ? schemaRoot(schema.initializer) : schema && ts.isShorthandPropertyAssignment(schema) ? "schema" : null;
        if (!name) throw new Error(`FORM_FIELDS.${p.name.text}: its schema is not a named schema`);
        out.set(p.name.text, name);
      }
    }
  }
  return out;
}

/** Everything that takes input a person might type: every action, and handlers with a JSON or multipart body. */
const takesInput: Declaration[] = [...scan.actions, ...scan.handlers.filter((h) => h.body === "json" || h.body === "multipart")];
const schemaOf = (d: Declaration) => (d.kind === "action" ? d.schema : d.bodySchema);

describe("every form is registered in FORM_FIELDS or exempt in NOT_FORMS", () => {
  const registered = registeredSchemaNames();
  const registeredNames = new Set(registered.values());

  it("reads the registry and the declarations", () => {
    expect([...registered.keys()].sort()).toEqual(Object.keys(FORM_FIELDS).sort());
    expect(scan.problems).toEqual([]);
    // 44 actions and 11 handlers with a body on 2026-12-04; a parser that found none would prove nothing.
    expect(takesInput.length).toBeGreaterThanOrEqual(55);
  });

  it("no declaration is neither a registered form nor exempt, or both", () => {
    const neither: string[] = [];
    const both: string[] = [];
    for (const d of takesInput) {
      const id = declarationId(d);
      const isForm = registeredNames.has(schemaOf(d) ?? "");
      const exempt = id in NOT_FORMS;
      if (!isForm && !exempt) neither.push(`${id} (input ${schemaOf(d) ?? "inline"})`);
      if (isForm && exempt) both.push(id);
    }
    expect(neither, "register the form's schema in FORM_FIELDS, or say in NOT_FORMS why its errors need no field").toEqual([]);
    expect(both, "registered and exempt at once: drop the NOT_FORMS line").toEqual([]);
  });

  it("no stale exemption or registration", () => {
    const ids = new Set(takesInput.map(declarationId));
    expect(Object.keys(NOT_FORMS).filter((id) => !ids.has(id)), "NOT_FORMS names no such action or handler").toEqual([]);
    const used = new Set(takesInput.map(schemaOf));
    expect([...registered].filter(([, schema]) => !used.has(schema)).map(([form, schema]) => `${form}: ${schema}`), "no action or handler takes this schema").toEqual([]);
    for (const reason of Object.values(NOT_FORMS)) expect(reason.length).toBeGreaterThan(10);
  });
});

describe("the zod-free field lists and the banner the forms show", () => {
  it("every FORM_VISIBLE list is the `visible` of the FORM_FIELDS entry of the same name", () => {
    for (const [form, list] of Object.entries(FORM_VISIBLE)) expect(FORM_FIELDS[form as keyof typeof FORM_FIELDS]?.visible, form).toBe(list);
  });

  it("every FORM_VISIBLE list is used by a form component", () => {
    // Forms that route their messages without it, and why.
    const without: Record<string, string> = {
      // Not rewired yet (issue 16 §7 leftover): it shows the route's message, so a refused
      // `version` (only a stale or tampered page sends one) says just "Some fields need attention."
      finding: "findings/_components/finding-editor.tsx shows each section's field messages itself",
      staffRole: "the role form shows every field message beside its one select (staff/_components/member-controls.tsx)",
    };
    const files = [...walkTsx("app"), ...walkTsx("components")].map((f) => fs.readFileSync(f, "utf8")).join("\n");
    const unused = Object.keys(FORM_VISIBLE).filter((form) => !(form in without) && !files.includes(`FORM_VISIBLE.${form}`));
    expect(unused).toEqual([]);
    expect(Object.keys(without).filter((form) => !(form in FORM_VISIBLE) || files.includes(`FORM_VISIBLE.${form}`)), "stale line in `without`").toEqual([]);
  });

  it("says a hidden field's message, points at shown ones, and keeps a refusal's own message", () => {
    const visible = ["email", "password"];
    expect(formBanner(null, visible)).toBeNull();
    expect(formBanner({ code: "unauthenticated", message: "Sign in first." }, visible)).toBe("Sign in first.");
    expect(formBanner({ code: "invalid", message: "Some fields need attention.", fields: { token: ["This link is incomplete."] } }, visible)).toBe("This link is incomplete.");
    expect(formBanner({ code: "invalid", message: "Some fields need attention.", fields: { email: ["Enter your e-mail."], next: ["Bad return address"] } }, visible)).toBe(
      "Bad return address Some fields need attention: see the messages beside them.",
    );
    // Too many tries is no typing mistake: its own message says more than "see beside them".
    expect(formBanner({ code: "rate_limited", message: "Wait an hour and ask again.", fields: { email: ["Too many requests for now."] } }, visible)).toBe("Wait an hour and ask again.");
    // Without a list every field counts as shown.
    expect(formBanner({ code: "invalid", message: "Some fields need attention.", fields: { job: ["No such job."] } })).toBe("Some fields need attention: see the messages beside them.");
  });
});
