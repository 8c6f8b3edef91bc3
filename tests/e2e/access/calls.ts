// Every persona × every declaration (× the media it names), as a call the test can make and the
// outcome the table says it must have.
import type { APIRequestContext } from "@playwright/test";
import type { MediaFacts } from "../../../lib/permissions";
import { type ActionDeclaration, type Declaration, type DeclarationScan, type HandlerDeclaration, declarationId } from "../../support/declarations";
import { type ActionRef, type Body, type HandlerCall, type Seen, callAction, callHandler, pagePath } from "./client";
import { CHECKED_INSIDE, type Outcome, PERSONA_NAMES, type PersonaName, expectedOutcome } from "./expected";
import { type Fixture, MEDIA } from "./fixture";
import { ACTION_SAMPLES, HANDLER_SAMPLES, paramValues } from "./samples";

export type Call = {
  decl: Declaration;
  /** The declaration's id, and which fixture media it named when there are several. */
  label: string;
  persona: PersonaName;
  expected: Outcome;
  /** Makes the call with this persona's context; extra headers for the attacker cases. */
  run: (ctx: APIRequestContext, headers?: Record<string, string>) => Promise<Seen>;
  /** For a handler: the request itself (the attacker cases send it masked). */
  http?: HandlerCall;
};

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);
export const isStateChanging = (d: Declaration) => d.kind === "action" || STATE_CHANGING.has(d.method);

/** The action's key in the build's manifest, "file#export". */
export const actionKey = (d: ActionDeclaration) => `${d.file}#${d.name}`;

/** Declarations the test can't call yet, each with what is missing. */
export function uncallable(scan: DeclarationScan, manifest: Map<string, ActionRef> | null): string[] {
  const out: string[] = [];
  for (const h of scan.handlers) {
    if (h.body !== "none" && !HANDLER_SAMPLES[declarationId(h)]?.body) out.push(`${declarationId(h)}: no sample body in tests/e2e/access/samples.ts`);
  }
  for (const a of scan.actions) {
    if (!ACTION_SAMPLES[actionKey(a)]) out.push(`${actionKey(a)}: no sample form in tests/e2e/access/samples.ts`);
    if (manifest && !manifest.has(actionKey(a))) out.push(`${actionKey(a)}: not in the build's server-reference manifest (no page imports it?)`);
  }
  return out;
}

/** The fixture media a photo or clip route names; one variant for everything else. */
function variants(d: Declaration, f: Fixture): { suffix: string; params: Record<string, string>; media?: MediaFacts }[] {
  if (d.resource === "photo") {
    return (["shared", "quoted", "shopOnly"] as const).map((k) => ({ suffix: ` [${k} photo]`, params: { photo: f.photos[k] }, media: MEDIA[k] }));
  }
  if (d.resource === "clip") return [{ suffix: " [shared clip]", params: { clip: f.clip }, media: MEDIA.clip }];
  return [{ suffix: "", params: {} }];
}

function handlerCall(h: HandlerDeclaration, f: Fixture, persona: PersonaName, params: Record<string, string>): HandlerCall {
  const sample = HANDLER_SAMPLES[declarationId(h)] ?? {};
  const values = { ...paramValues(f), ...sample.params?.(f), ...params };
  const path = h.route.replace(/\[([^\]]+)\]/g, (_, name: string) => encodeURIComponent(values[name] ?? `missing-${name}`));
  const body: Body = h.body === "none" ? { kind: "none" } : sample.body!({ f, persona });
  return { method: h.method, path, query: sample.query, body };
}

function actionRun(a: ActionDeclaration, f: Fixture, persona: PersonaName, ref: ActionRef) {
  // The page the form is on: the first page bundling the action whose address the fixture fills.
  const values = { ...paramValues(f), story: String(f.story) };
  const page = ref.workers.map((w) => pagePath(w, values)).find((p) => p !== null);
  if (!page) throw new Error(`${actionKey(a)}: none of its pages (${ref.workers.join(", ")}) has an address the fixture can fill`);
  const fields = ACTION_SAMPLES[actionKey(a)]!({ f, persona });
  return (ctx: APIRequestContext, headers?: Record<string, string>) => callAction(ctx, { id: ref.id, page, fields }, headers);
}

export function planCalls(scan: DeclarationScan, f: Fixture, manifest: Map<string, ActionRef>): Call[] {
  const calls: Call[] = [];
  for (const d of [...scan.handlers, ...scan.actions]) {
    const id = declarationId(d);
    const inside = CHECKED_INSIDE[id];
    for (const v of variants(d, f)) {
      for (const persona of PERSONA_NAMES) {
        const expected = expectedOutcome(persona, { resource: inside?.resource ?? d.resource, permission: inside?.permission ?? d.permission, media: v.media });
        if (d.kind === "handler") {
          const http = handlerCall(d, f, persona, v.params);
          calls.push({ decl: d, label: id + v.suffix, persona, expected, http, run: (ctx, headers) => callHandler(ctx, http, headers) });
        } else {
          calls.push({ decl: d, label: id + v.suffix, persona, expected, run: actionRun(d, f, persona, manifest.get(actionKey(d))!) });
        }
      }
    }
  }
  return calls;
}
