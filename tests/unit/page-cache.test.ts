import { NextRequest } from "next/server";
import { describe, expect, it } from "vitest";
import { RENDER_HEADER, innerRenderNonce, jobPageOf, servePageFromCache } from "@/lib/server/page-cache";

// What the page cache (lib/server/page-cache.ts) takes on; its serving is tested end to end in
// tests/e2e/page-cache.spec.ts, against the app's own render and the database's version counters.

describe("page cache", () => {
  it("serves the two job pages only, by their exact addresses", () => {
    expect(jobPageOf("/my/jobs/AbC123xyz0000000")).toEqual({ area: "owner", publicId: "AbC123xyz0000000" });
    expect(jobPageOf("/shop/copper-gulch/jobs/12")).toEqual({ area: "staff", shopSlug: "copper-gulch", number: 12 });
    expect(jobPageOf("/shop/copper-gulch/jobs/12/")).toEqual({ area: "staff", shopSlug: "copper-gulch", number: 12 });
    for (const other of ["/my", "/my/jobs/abc/invoice", "/shop/copper-gulch/jobs/12/bench", "/shop/copper-gulch/jobs/new", "/shop/copper-gulch", "/s/copper-gulch/jobs/12", "/my/jobs/a%2Fb"]) {
      expect(jobPageOf(other), other).toBeNull();
    }
  });

  it("takes a placeholder nonce only from its own render, never from a visitor who sends the headers", () => {
    const forged = new NextRequest("http://localhost/my/jobs/AbC123xyz0000000", {
      headers: { [RENDER_HEADER]: "guessed-secret", "x-benchside-nonce-placeholder": "QUJDREVGR0hJSktMTU5PUA==" },
    });
    expect(innerRenderNonce(forged)).toBeNull();
    expect(innerRenderNonce(new NextRequest("http://localhost/my/jobs/AbC123xyz0000000"))).toBeNull();
  });

  it("stays out of the way outside a production server", async () => {
    const request = new NextRequest("http://localhost/my/jobs/AbC123xyz0000000", { headers: { accept: "text/html", cookie: "authjs.session-token=x" } });
    // Vitest runs with NODE_ENV=test and no server origin: no lookup, no render.
    expect(await servePageFromCache(request, () => ({}))).toBeNull();
  });
});
