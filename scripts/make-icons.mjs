// Makes the PNG/ICO app icons from app/icon.svg (our mark). Run once after changing the SVG and
// commit the output: `node scripts/make-icons.mjs`. Next serves them by file convention
// (app/icon.svg, app/apple-icon.png, app/favicon.ico) and the manifest's from public/, so nothing
// is generated at build time.
import { readFile, writeFile } from "node:fs/promises";
import sharp from "sharp";

const svg = await readFile(new URL("../app/icon.svg", import.meta.url), "utf8");
const png = (source, size) => sharp(Buffer.from(source), { density: 72 * (size / 64) }).resize(size, size).png({ compressionLevel: 9 }).toBuffer();

// Home-screen icon: square and full-bleed, because the phone rounds the corners itself.
const square = svg.replace(/<rect ([^>]*)rx="\d+"/, "<rect $1");
await writeFile(new URL("../app/apple-icon.png", import.meta.url), await png(square, 180));

// The installable staff app's icons (app/manifest.ts), in public/ so they keep fixed addresses.
// "any": the mark as it is, rounded corners and all. "maskable": full-bleed, with the nut drawn at
// 85 % so it stays inside the middle circle (40 % of the size as radius) a phone's mask may keep
// (W3C Web App Manifest, "icon masks": the safe zone).
const maskable = square.replace(/(<path[\s\S]*<\/svg>)/, '<g transform="translate(32 32) scale(.85) translate(-32 -32)">$1').replace("</svg>", "</g></svg>");
for (const [file, source, size] of [
  ["icon-192.png", svg, 192],
  ["icon-512.png", svg, 512],
  ["icon-maskable-512.png", maskable, 512],
]) {
  await writeFile(new URL(`../public/${file}`, import.meta.url), await png(source, size));
}

// favicon.ico for whatever asks for /favicon.ico directly: an ICO directory of PNG images
// (allowed since Windows Vista; every current browser reads it).
const sizes = [16, 32, 48];
const images = await Promise.all(sizes.map((s) => png(svg, s)));
const header = Buffer.alloc(6 + 16 * sizes.length);
header.writeUInt16LE(0, 0); // reserved
header.writeUInt16LE(1, 2); // type: icon
header.writeUInt16LE(sizes.length, 4);
let offset = header.length;
sizes.forEach((s, i) => {
  const at = 6 + 16 * i;
  header.writeUInt8(s, at); // width
  header.writeUInt8(s, at + 1); // height
  header.writeUInt8(0, at + 2); // no palette
  header.writeUInt8(0, at + 3);
  header.writeUInt16LE(1, at + 4); // colour planes
  header.writeUInt16LE(32, at + 6); // bits per pixel
  header.writeUInt32LE(images[i].length, at + 8);
  header.writeUInt32LE(offset, at + 12);
  offset += images[i].length;
});
await writeFile(new URL("../app/favicon.ico", import.meta.url), Buffer.concat([header, ...images]));
console.log("wrote app/apple-icon.png, app/favicon.ico and public/icon-192.png, icon-512.png, icon-maskable-512.png");
