import "server-only";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { ImageResponse } from "next/og";

// Social cards (Open Graph images) for the public portfolio, drawn by next/og in our palette and
// our shipped font. next/og reads TTF/OTF/WOFF but not WOFF2, so public/fonts also holds two
// static TrueType instances of the same Archivo variable font (SIL OFL, ARCHIVO-OFL.txt),
// made from archivo-wght.woff2 with Debian's python3-fonttools:
//   fontTools.varLib.instancer.instantiateVariableFont(TTFont("archivo-wght.woff2"), {"wght": 400|700})
// then saved without the WOFF2 flavour as archivo-400.ttf / archivo-700.ttf.

export const OG_SIZE = { width: 1200, height: 630 } as const;

// Light palette values (app/globals.css).
const C = { paper: "#F5F2EC", surface: "#FFFDF9", ink: "#1E1B17", inkMuted: "#595249", line: "#D8D1C5", oil: "#0D5257", onOil: "#FFFFFF", brassSoft: "#F3E7C6" };

let fonts: Promise<{ name: string; data: Buffer; weight: 400 | 700; style: "normal" }[]> | undefined;
function loadFonts() {
  const dir = path.join(process.cwd(), "public", "fonts");
  fonts ??= Promise.all(
    ([400, 700] as const).map(async (weight) => ({ name: "Archivo", data: await readFile(path.join(dir, `archivo-${weight}.ttf`)), weight, style: "normal" as const })),
  ).catch((error: unknown) => {
    fonts = undefined; // try again next time rather than keep a failure
    throw error;
  });
  return fonts;
}

const clip = (s: string, max: number) => (s.length > max ? `${s.slice(0, max - 1).trimEnd()}…` : s);

/** A card: the shop's name, a big title, one line under it, and the cover photo when there is one. */
export async function portfolioCard(p: { shopName: string; title: string; line: string; photo?: { data: Buffer; contentType: string } | null }): Promise<ImageResponse> {
  const photoSrc = p.photo ? `data:${p.photo.contentType};base64,${p.photo.data.toString("base64")}` : null;
  return new ImageResponse(
    (
      <div style={{ width: "100%", height: "100%", display: "flex", backgroundColor: C.paper, fontFamily: "Archivo", color: C.ink }}>
        <div style={{ display: "flex", flexDirection: "column", justifyContent: "space-between", flex: 1, padding: "64px 56px" }}>
          <div style={{ display: "flex", fontSize: 30, fontWeight: 700, color: C.oil, letterSpacing: 1, textTransform: "uppercase" }}>{clip(p.shopName, 40)}</div>
          <div style={{ display: "flex", flexDirection: "column", gap: 20 }}>
            <div style={{ display: "flex", fontSize: photoSrc ? 60 : 72, fontWeight: 700, lineHeight: 1.1 }}>{clip(p.title, 90)}</div>
            <div style={{ display: "flex", fontSize: 32, fontWeight: 400, color: C.inkMuted }}>{clip(p.line, 70)}</div>
          </div>
          <div style={{ display: "flex", alignItems: "center", gap: 14, fontSize: 26, fontWeight: 700 }}>
            <div style={{ display: "flex", width: 40, height: 40, borderRadius: 10, backgroundColor: C.oil, alignItems: "center", justifyContent: "center" }}>
              <div style={{ display: "flex", width: 14, height: 14, borderRadius: 7, backgroundColor: C.brassSoft }} />
            </div>
            Benchside
          </div>
        </div>
        {photoSrc ? (
          <div style={{ display: "flex", width: 470, height: "100%", padding: "40px 40px 40px 0" }}>
            {/* eslint-disable-next-line @next/next/no-img-element -- next/og draws plain <img> */}
            <img src={photoSrc} alt="" width={430} height={550} style={{ width: 430, height: 550, objectFit: "cover", borderRadius: 24, border: `2px solid ${C.line}` }} />
          </div>
        ) : null}
      </div>
    ),
    { ...OG_SIZE, fonts: await loadFonts(), headers: { "cache-control": "public, no-cache" } },
  );
}

export function notFoundImage(): Response {
  return new Response("Not found", { status: 404, headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" } });
}
