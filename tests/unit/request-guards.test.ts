import { describe, expect, it } from "vitest";
import { ACTION_BODY_LIMIT, actionRefusal } from "@/lib/action-guard";
import { crossSiteRefusal, mediaTypeRefusal } from "@/lib/server/request-guard";

// The cross-site and media-type rules every state-changing handler and server action goes
// through (lib/route.ts, lib/action.ts, proxy.ts). Origins are compared exactly, as the Fetch
// standard's "same origin" (scheme, host and port): https://fetch.spec.whatwg.org/#concept-request-origin

const APP = new URL("http://localhost:3110/api/jobs/x/entries");

describe("crossSiteRefusal", () => {
  it("lets the app's own origin and header-less clients through", () => {
    expect(crossSiteRefusal(new Headers({ origin: "http://localhost:3110", "sec-fetch-site": "same-origin" }), APP)).toBeNull();
    expect(crossSiteRefusal(new Headers(), APP)).toBeNull();
  });

  it("refuses another port of the same host (same site, other origin)", () => {
    expect(crossSiteRefusal(new Headers({ origin: "http://localhost:3999" }), APP)?.code).toBe("forbidden");
    expect(crossSiteRefusal(new Headers({ "sec-fetch-site": "same-site" }), APP)?.code).toBe("forbidden");
    expect(crossSiteRefusal(new Headers({ "sec-fetch-site": "cross-site", origin: "https://elsewhere.test" }), APP)?.code).toBe("forbidden");
    expect(crossSiteRefusal(new Headers({ origin: "null" }), APP)?.code).toBe("forbidden");
  });
});

describe("mediaTypeRefusal", () => {
  it("accepts the exact media type, with parameters", () => {
    expect(mediaTypeRefusal(new Headers({ "content-type": "application/json" }), "application/json")).toBeNull();
    expect(mediaTypeRefusal(new Headers({ "content-type": "Application/JSON; charset=utf-8" }), "application/json")).toBeNull();
  });

  it("refuses a masked or missing type with 415", () => {
    // A "simple" request (no preflight) can carry text/plain with any parameters (Fetch standard, CORS-safelisted request-header).
    expect(mediaTypeRefusal(new Headers({ "content-type": "text/plain;charset=application/json" }), "application/json")?.status).toBe(415);
    expect(mediaTypeRefusal(new Headers(), "application/json")?.status).toBe(415);
    expect(mediaTypeRefusal(new Headers({ "content-type": "application/x-www-form-urlencoded" }), "multipart/form-data")?.status).toBe(415);
  });
});

describe("actionRefusal", () => {
  const own = new Set(["http://localhost:3110"]);
  // As React's client encodes (previousState, formData): the arguments as "0", the form's fields as "_1_<name>".
  const form = (root: string | null = '[null,"$K1"]') => {
    const f = new FormData();
    if (root !== null) f.set("0", root);
    f.set("_1_job", "abc");
    return f;
  };
  const post = async (headers: Record<string, string>, body?: BodyInit) => {
    const req = new Request("http://localhost:3110/shop/x", { method: "POST", headers: { "next-action": "abc123", ...headers }, body });
    return actionRefusal(req, own);
  };
  const multipart = async (headers: Record<string, string> = {}, body = form()) => {
    const encoded = new Request("http://x", { method: "POST", body });
    const bytes = await encoded.arrayBuffer();
    return post({ "content-type": encoded.headers.get("content-type")!, "content-length": String(bytes.byteLength), ...headers }, bytes);
  };

  it("passes a well-formed same-origin form and ignores requests that aren't actions", async () => {
    expect(await multipart({ origin: "http://localhost:3110" })).toBeNull();
    expect(await actionRefusal(new Request("http://localhost:3110/shop/x", { method: "POST", headers: { origin: "http://evil.test" } }), own)).toBeNull();
  });

  it("answers 403, 415, 411, 413 and 400 where Next would answer 500", async () => {
    expect((await multipart({ origin: "http://localhost:3999" }))?.status).toBe(403);
    expect((await post({ "content-type": "application/json", "content-length": "2" }, "[]"))?.status).toBe(415);
    expect((await post({ "content-type": "multipart/form-data; boundary=x" }, "--x"))?.status).toBe(411);
    expect((await post({ "content-type": "multipart/form-data; boundary=x", "content-length": String(ACTION_BODY_LIMIT + 1) }, "--x"))?.status).toBe(413);
    const cut = "--x\r\ncontent-disposition: form-data; name=\"job\"\r\n\r\nab";
    expect((await post({ "content-type": "multipart/form-data; boundary=x", "content-length": String(cut.length) }, cut))?.status).toBe(400);
  });

  it("refuses an Origin that isn't the Host Next compares it with (x-forwarded-host first)", async () => {
    expect(await multipart({ origin: "http://localhost:3110", host: "localhost:3110" })).toBeNull();
    expect((await multipart({ origin: "http://localhost:3110", "x-forwarded-host": "elsewhere.test" }))?.status).toBe(403);
  });

  it("answers 400 for argument lists Next's decoder would throw on", async () => {
    for (const root of [null, "", "[", "42", "null", "{}", '"x"', '[null,"$@1"]', '[null,"$Q2"]', '["$T"]', `[null,"$n${"1".repeat(301)}"]`]) {
      expect((await multipart({}, form(root)))?.status, String(root)).toBe(400);
    }
    for (const root of ["[]", "[null]", '[null,"$K2"]', '[{"ok":false,"values":{"note":"$$5"}},"$K1"]', '[{"at":"$D2026-01-01T00:00:00.000Z"},"$K1"]']) {
      expect(await multipart({}, form(root)), root).toBeNull();
    }
  });

  it("screens a multipart POST to a page as a possible no-JS form action, not one to a route handler", async () => {
    const mpa = (fields: Record<string, string>, headers: Record<string, string> = {}, page = true) => {
      const f = new FormData();
      for (const [k, v] of Object.entries(fields)) f.set(k, v);
      const encoded = new Request("http://x", { method: "POST", body: f });
      return encoded.arrayBuffer().then((bytes) =>
        actionRefusal(new Request("http://localhost:3110/shop/x", { method: "POST", headers: { "content-type": encoded.headers.get("content-type")!, "content-length": String(bytes.byteLength), ...headers }, body: bytes }), own, { page }),
      );
    };
    expect(await mpa({ $ACTION_REF_1: "", "$ACTION_1:0": '{"id":"abc","bound":"$@1"}', "$ACTION_1:1": "[null]", $ACTION_KEY: "k1" })).toBeNull();
    expect((await mpa({ $ACTION_REF_1: "", "$ACTION_1:0": '{"id":"abc",' }))?.status).toBe(400);
    expect((await mpa({ note: "x" }, { origin: "http://localhost:3999" }))?.status).toBe(403);
    expect(await mpa({ note: "x" }, { origin: "http://localhost:3999" }, false)).toBeNull();
  });
});
