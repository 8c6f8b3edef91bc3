// One malformed request for a server action, as React's client would frame it (multipart: field
// "0" the argument list, "_1_<name>" the form's fields; header Next-Action) and then broken: the
// envelope (origin, media type, length, cut-off body, argument list, action id), or the form's
// fields (wrong values, missing, files, junk keys). Harmless by construction like cases.ts: an
// envelope refused before the action runs, no form reaching it, a resource id no row has, a
// stranger or no session, or — for the public actions without a resource — a field that can't be
// valid (PUBLIC_BREAKERS). A new public action fails the test until it has a line there.
import { APP_ORIGIN } from "../access/client";
import { type Case, PERMITTED, type Persona } from "./cases";
import { type Rng, brokenMultipart, multipart, wrongFormValue } from "./values";
import { type ActionTarget, STRANGER, type World, idKind, madeUpId, realValue } from "./world";

const noAt = (rng: Rng) => wrongFormValue(rng).replaceAll("@", "");

/** For each action with no resource: a field value that can't pass its schema, or null (only broken envelopes). */
export const PUBLIC_BREAKERS: Record<string, ((rng: Rng) => Record<string, string>) | null> = {
  signInWithPassword: (rng) => ({ email: noAt(rng) }),
  requestOwnerLink: (rng) => ({ email: noAt(rng) }),
  // Not 43 characters of [A-Za-z0-9_-].
  signInWithLink: (rng) => ({ token: rng.pick([rng.string(42), rng.string(44), `${rng.string(42)}!`, "", "x".repeat(10_000)]) }),
  // Over the 200 characters the schema allows.
  unsubscribeAction: (rng) => ({ token: "x".repeat(201 + rng.int(20_000)) }),
  // Staff accounts (issue 16 §3): a token of the wrong shape, an address with no @, a current password over the cap.
  acceptInviteAction: (rng) => ({ token: rng.pick([rng.string(42), rng.string(44), `${rng.string(42)}!`, ""]) }),
  resetPasswordAction: (rng) => ({ token: rng.pick([rng.string(42), rng.string(44), `${rng.string(42)}!`, ""]) }),
  requestPasswordResetAction: (rng) => ({ email: noAt(rng) }),
  changeOwnPasswordAction: (rng) => ({ current: "x".repeat(401 + rng.int(5_000)) }),
  // A new shop (issue 16 §1): an address with no @; a confirmation token of the wrong shape.
  startShopAction: (rng) => ({ email: noAt(rng) }),
  confirmShopAction: (rng) => ({ token: rng.pick([rng.string(42), rng.string(44), `${rng.string(42)}!`, ""]) }),
  // A booking request from the public page (issue 16 §6): an address with no @.
  requestBookingAction: (rng) => ({ email: noAt(rng) }),
  // Any form at all is valid for these: they get broken envelopes only.
  signOutAction: null,
  signOutEverywhereAction: null,
};

type Root = { text: string | null; form: "yes" | "empty" | "none" };
const ROOTS: Root[] = [
  { text: '[null,"$K2"]', form: "empty" },
  { text: "[]", form: "none" },
  { text: "[null]", form: "none" },
  { text: "[null,null]", form: "none" },
  { text: "[null,{}]", form: "none" },
  { text: '[null,"$$K1"]', form: "none" },
  { text: "null", form: "none" },
  { text: "{}", form: "none" },
  { text: "42", form: "none" },
  { text: '"x"', form: "none" },
  { text: "[", form: "none" },
  { text: '[null,"$@1"]', form: "none" },
  { text: '[null,"$Q1"]', form: "none" },
  { text: '["$T","$K1"]', form: "none" },
  { text: '[null,"$F1"]', form: "none" },
  { text: '[null,"$B1"]', form: "none" },
  { text: `[${"[".repeat(3000)}${"]".repeat(3000)},"$K1"]`, form: "none" },
  { text: null, form: "none" },
];

export function actionCase(rng: Rng, t: ActionTarget, world: World): Case {
  const name = t.decl.name;
  const breaker = t.decl.resource ? undefined : PUBLIC_BREAKERS[name];
  if (breaker === undefined && !t.decl.resource) throw new Error(`fuzz: ${t.id} has no resource: add how to break its form to PUBLIC_BREAKERS (tests/e2e/fuzz/action-cases.ts)`);
  const persona: Persona = rng.pick<Persona>(["anonymous", STRANGER, STRANGER, ...PERMITTED]);
  const reasons: string[] = [];
  const envelopeOnly = breaker === null;
  // The form's own fields.
  const fields: Record<string, string> = {};
  const files: [string, { file: string; type: string; data: Buffer }][] = [];
  for (const field of t.fields) {
    const roll = rng.next();
    if (roll < 0.12) continue;
    if (roll < 0.2) files.push([field, { file: rng.pick(["x.txt", "", "../x"]), type: rng.pick(["text/plain", "image/png", ""]), data: Buffer.alloc(rng.int(2048), 65) }]);
    else fields[field] = wrongFormValue(rng);
  }
  const strangerMay = (persona === STRANGER || persona === "anonymous") && t.decl.permission !== "public";
  for (const field of t.resourceFields) {
    const kind = idKind(field, "form");
    const real = strangerMay && rng.chance(0.6) ? realValue(rng, field, "form", world) : null;
    fields[field] = real ?? (kind && rng.chance(0.85) ? madeUpId(rng, kind, world) : wrongFormValue(rng));
    if (real === null) reasons.push(kind ? `made-up ${field}` : `malformed ${field}`);
  }
  if (strangerMay) reasons.push(persona === STRANGER ? "stranger to the row" : "no session");
  if (breaker) {
    Object.assign(fields, breaker(rng));
    reasons.push("a field that can't pass the schema");
  }
  // Keys that are special to objects, and one the schema doesn't know.
  const junk: [string, string][] = rng.chance(0.15) ? [["__proto__", "x"], ["constructor", "x"], [rng.string(6), wrongFormValue(rng)]] : [];

  let root: Root = { text: '[null,"$K1"]', form: "yes" };
  let mutation = "form:wrong-values";
  if (rng.chance(0.2) || envelopeOnly) {
    root = rng.pick(ROOTS.filter((r) => !envelopeOnly || r.form === "none"));
    mutation = "envelope:arguments";
    if (root.form === "none") reasons.unshift("no form reaches the action");
  }
  const boundary = `----fuzz${rng.string(16)}`;
  const parts: [string, string | { file: string; type: string; data: Buffer }][] = [];
  if (root.text !== null) parts.push(["0", root.text]);
  for (const [k, v] of Object.entries(fields)) parts.push([`_1_${k}`, v], ...(rng.chance(0.05) ? ([[`_1_${k}`, wrongFormValue(rng)]] as [string, string][]) : []));
  for (const [k, v] of [...files, ...junk]) parts.push([`_1_${k}`, v]);
  let body = multipart(parts, boundary);
  const headers: Record<string, string> = { "next-action": t.actionId, accept: "text/x-component", origin: APP_ORIGIN, "content-type": `multipart/form-data; boundary=${boundary}` };
  const c: Case = { target: t.id, mutation, safe: "", persona, method: "POST", path: t.page, headers, body, expect: "action" };

  // A broken envelope, refused before the action is looked up (and, for the sign-outs, always one).
  if (rng.chance(0.3) || (envelopeOnly && root.form !== "none")) {
    const how = rng.pick(["origin", "site", "host", "type", "chunked", "too-long", "cut", "action-id", "no-js"] as const);
    c.mutation = `envelope:${how}`;
    reasons.unshift(how === "action-id" ? "no such action" : "envelope refused");
    if (how === "origin") headers.origin = rng.pick(["http://127.0.0.1:3999", "null", "https://elsewhere.test", "garbage", "http://localhost"]);
    if (how === "site") headers["sec-fetch-site"] = rng.pick(["cross-site", "same-site"]);
    if (how === "host") headers["x-forwarded-host"] = rng.pick(["elsewhere.test", "localhost:1", ",", "a,b"]);
    if (how === "type") headers["content-type"] = rng.pick(["application/json", "text/plain;charset=UTF-8", "application/x-www-form-urlencoded", "", "multipart/mixed; boundary=x", "Multipart/Form-Data"]);
    if (how === "chunked") c.framing = "chunked";
    if (how === "too-long") c.framing = { declaredLength: Math.max(body.length + 1, rng.pick([6 * 1024 * 1024 + 1, 2 ** 32, 99_999_999_999])) };
    if (how === "cut") body = brokenMultipart(rng, body, boundary);
    if (how === "action-id") headers["next-action"] = rng.pick([`7f${rng.string(40, "0123456789abcdef")}`, rng.string(42, "0123456789abcdef"), "x", "", "toString", "__proto__", "a".repeat(5000), "%ZZ"]);
    if (how === "no-js") {
      // A no-JS form post naming the action, with a broken descriptor: refused by the proxy.
      delete headers["next-action"];
      headers.accept = "text/html";
      body = multipart([["$ACTION_REF_1", ""], ["$ACTION_1:0", rng.pick([`{"id":"${t.actionId}",`, "{", "[]", `{"id":5}`])], ["$ACTION_1:1", rng.pick(["[", "[null]"])], ...Object.entries(fields)], boundary);
      c.expect = "page";
    }
    c.body = body;
  } else if (rng.chance(0.006)) {
    // Over the 6 MB limit for real, with the length said.
    c.body = Buffer.concat([body, Buffer.alloc(6 * 1024 * 1024 + 1, 120)]);
    c.mutation = "envelope:over-6MB";
    reasons.unshift("envelope refused");
  }
  // Nothing above rules a write out (a public action with a real-looking form): should not happen.
  if (reasons.length === 0) throw new Error(`fuzz: the case for ${t.id} has nothing that keeps it harmless (${c.mutation})`);
  c.safe = reasons[0]!;
  return c;
}
