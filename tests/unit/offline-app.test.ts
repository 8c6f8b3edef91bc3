import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import manifest from "@/app/manifest";
import {
  PAGES_CACHE,
  PHOTOS_CACHE,
  PRIVATE_CACHES,
  STATIC_CACHE,
  SW_SCOPE,
  endedSession,
  isCachedPhoto,
  isOfflinePage,
  isStaticAsset,
  keepable,
  neverCached,
} from "@/lib/offline/cache-rules";
// @ts-expect-error -- plain ESM without type declarations (next.config.mjs loads it as it is)
import { workerFileName } from "../../scripts/build-sw.mjs";

// Issue 20 §1: the installable staff app: its manifest and icons, and what its service worker
// (lib/offline/sw.ts) keeps and never keeps.

const ROOT = path.resolve(__dirname, "../..");
const ORIGIN = "https://bench.example.test";
const req = (url: string, { method = "GET", headers = {} as Record<string, string> } = {}) => ({
  url: url.startsWith("/") ? ORIGIN + url : url,
  method,
  headers: new Headers(headers),
});

/** A light-mode palette value from app/globals.css, as #RRGGBB (the comment beside each variable). */
function paletteHex(name: string): string {
  const css = readFileSync(path.join(ROOT, "app/globals.css"), "utf8");
  const found = new RegExp(`--${name}: [\\d ]+; /\\* (#[0-9A-F]{6}) \\*/`).exec(css);
  if (!found) throw new Error(`--${name} not found in globals.css`);
  return found[1]!;
}

describe("web app manifest", () => {
  const m = manifest();

  it("names the app ours and opens standalone on the staff board, inside its scope", () => {
    expect(m.name).toBe("Benchside");
    expect(m.short_name).toBe("Benchside");
    expect(m.display).toBe("standalone");
    expect(m.start_url).toBe("/shop");
    expect(m.id).toBe("/shop");
    const scope = new URL(m.scope ?? "/", ORIGIN).pathname;
    expect(new URL(m.start_url!, ORIGIN).pathname.startsWith(scope)).toBe(true);
  });

  it("takes its colours from the palette: paper behind the splash and the bar, as the viewport's light theme", () => {
    expect(m.background_color).toBe(paletteHex("paper"));
    expect(m.theme_color).toBe(paletteHex("paper"));
    const layout = readFileSync(path.join(ROOT, "app/layout.tsx"), "utf8");
    expect(layout).toContain(`{ media: "(prefers-color-scheme: light)", color: "${m.theme_color}" }`);
  });

  it("lists icons that exist at the sizes they claim, 192 and 512 px and a maskable one", async () => {
    const icons = m.icons ?? [];
    for (const icon of icons) {
      const file = [path.join(ROOT, "public", icon.src), path.join(ROOT, "app", icon.src)].find((f) => existsSync(f));
      expect(file, icon.src).toBeDefined();
      if (icon.type === "image/png") {
        const meta = await sharp(file!).metadata();
        expect(`${meta.width}x${meta.height}`, icon.src).toBe(icon.sizes);
        expect(meta.format).toBe("png");
      }
    }
    const pngs = icons.filter((i) => i.type === "image/png");
    expect(pngs.filter((i) => (i.purpose ?? "any") === "any").map((i) => i.sizes)).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    expect(pngs.filter((i) => i.purpose === "maskable").map((i) => i.sizes)).toEqual(["512x512"]);
  });

  it("draws the maskable icon full-bleed, with the mark inside the safe zone", async () => {
    // W3C Web Application Manifest, "Icon masks": the safe zone is a circle centred on the icon
    // with a radius of 40 % of its size; anything outside it may be cut off by the phone's mask.
    const src = (m.icons ?? []).find((i) => i.purpose === "maskable")!.src;
    const { data, info } = await sharp(path.join(ROOT, "public", src)).raw().toBuffer({ resolveWithObject: true });
    const size = info.width;
    const oil = [0x0d, 0x52, 0x57];
    let outside = 0;
    let opaqueCorners = 0;
    for (let y = 0; y < size; y++) {
      for (let x = 0; x < size; x++) {
        const at = (y * size + x) * info.channels;
        const px = [data[at]!, data[at + 1]!, data[at + 2]!];
        const alpha = info.channels === 4 ? data[at + 3]! : 255;
        const background = px.every((v, i) => Math.abs(v - oil[i]!) <= 8);
        const r = Math.hypot(x + 0.5 - size / 2, y + 0.5 - size / 2);
        if (!background && r > 0.4 * size) outside++;
        if ((x === 0 || x === size - 1) && (y === 0 || y === size - 1) && alpha === 255) opaqueCorners++;
      }
    }
    expect(outside).toBe(0);
    expect(opaqueCorners).toBe(4);
  });
});

describe("what the staff app's service worker keeps", () => {
  it("keeps staff job and bench pages, not other pages, React payloads or redirected addresses", () => {
    expect(isOfflinePage(req("/shop/copper-gulch/jobs/12"), ORIGIN)).toBe(true);
    expect(isOfflinePage(req("/shop/copper-gulch/jobs/12/bench"), ORIGIN)).toBe(true);
    expect(isOfflinePage(req("/shop/copper-gulch/jobs/12?intake=1"), ORIGIN)).toBe(true);
    for (const other of ["/shop/copper-gulch", "/shop/copper-gulch/jobs/12/invoice", "/shop/copper-gulch/jobs/12/", "/my/jobs/abc", "/s/copper-gulch", "/shop/copper-gulch/jobs/new"]) {
      expect(isOfflinePage(req(other), ORIGIN), other).toBe(false);
    }
    // Next's client router asks for the page's data, not the page: never answered from the page cache.
    expect(isOfflinePage(req("/shop/copper-gulch/jobs/12", { headers: { RSC: "1" } }), ORIGIN)).toBe(false);
    expect(isOfflinePage(req("/shop/copper-gulch/jobs/12?_rsc=1x2y3"), ORIGIN)).toBe(false);
    expect(isOfflinePage(req("https://elsewhere.example.test/shop/copper-gulch/jobs/12"), ORIGIN)).toBe(false);
  });

  it("never caches a POST, sign-in, or an API answer other than a photo rendition", () => {
    expect(neverCached(req("/shop/copper-gulch/jobs/12", { method: "POST" }), ORIGIN)).toBe(true);
    expect(isOfflinePage(req("/shop/copper-gulch/jobs/12", { method: "POST" }), ORIGIN)).toBe(false);
    for (const auth of ["/api/auth/session", "/api/auth/csrf", "/api/auth"]) {
      expect(neverCached(req(auth), ORIGIN), auth).toBe(true);
      expect(isCachedPhoto(req(auth), ORIGIN) || isStaticAsset(req(auth), ORIGIN) || isOfflinePage(req(auth), ORIGIN), auth).toBe(false);
    }
    expect(isCachedPhoto(req("/api/photos/ph_123/display"), ORIGIN)).toBe(true);
    expect(isCachedPhoto(req("/api/photos/ph_123/w640"), ORIGIN)).toBe(true);
    for (const api of ["/api/jobs/abc/timeline", "/api/shops/copper-gulch/inbox", "/api/jobs/abc/photos", "/api/clips/cl_1/media", "/api/approvals/r1/evidence/p1/thumb"]) {
      expect(isCachedPhoto(req(api), ORIGIN) || isStaticAsset(req(api), ORIGIN) || isOfflinePage(req(api), ORIGIN), api).toBe(false);
    }
    expect(isCachedPhoto(req("/api/photos/ph_123/display", { method: "DELETE" }), ORIGIN)).toBe(false);
  });

  it("keeps build files", () => {
    expect(isStaticAsset(req("/_next/static/chunks/0a1b2c.js"), ORIGIN)).toBe(true);
    expect(isStaticAsset(req("/_next/image?url=x"), ORIGIN)).toBe(false);
  });

  it("keeps only whole first-hand pages, and reads a redirect to sign-in as the end of the session", () => {
    expect(keepable({ status: 200, redirected: false, type: "basic" })).toBe(true);
    expect(keepable({ status: 200, redirected: true, type: "basic" })).toBe(false);
    expect(keepable({ status: 0, redirected: false, type: "opaqueredirect" })).toBe(false);
    for (const status of [203, 304, 403, 404, 500, 503]) expect(keepable({ status, redirected: false })).toBe(false);
    expect(endedSession({ redirected: true, url: `${ORIGIN}/sign-in?next=%2Fshop%2Fx` })).toBe(true);
    expect(endedSession({ redirected: true, url: `${ORIGIN}/shop/x/jobs/12` })).toBe(false);
    expect(endedSession({ redirected: false, url: `${ORIGIN}/sign-in` })).toBe(false);
  });

  it("empties the pages and photos at sign-out, not the build files", () => {
    expect([...PRIVATE_CACHES].sort()).toEqual([PAGES_CACHE, PHOTOS_CACHE].sort());
    expect(PRIVATE_CACHES).not.toContain(STATIC_CACHE);
    expect(SW_SCOPE).toBe("/shop/");
  });

  it("gives each build folder a worker file of its own", () => {
    expect(workerFileName("/work/app/.next")).toBe("next.js");
    expect(workerFileName(".next-test")).toBe("next-test.js");
    expect(workerFileName("/work/app/.next-helper/")).toBe("next-helper.js");
    expect(workerFileName("build out")).toBe("build-out.js");
  });
});
