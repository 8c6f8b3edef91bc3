// The kind of file a photo set or a clip takes, checked in the browser when the file is picked
// (issue 20 §3): a wrong one is named with what it seems to be and what is accepted, before
// anything is sent or kept in the outbox. The server checks again (lib/server/photos.ts sniffs
// the bytes; lib/schemas/clips.ts the declared type). Pure and zod-free: client components use it.

type Picked = { name: string; type: string };

const PHOTO_TYPES = new Set(["image/jpeg", "image/png", "image/webp"]);
const PHOTO_EXT = /\.(jpe?g|png|webp)$/i;
const HEIC = /^image\/hei[cf]$|\.hei[cf]$/i;
const VIDEO_EXT = /\.(mp4|m4v|mov|webm|3gp|3g2|mkv|avi)$/i;

export const PHOTO_ACCEPTED = "A photo set takes JPEG, PNG or WebP photos.";
export const CLIP_ACCEPTED = "Clips take video files (MP4, MOV, WebM, 3GP…) from the camera or the gallery.";

/** The name as it is shown in a message: printable and short. */
export function shownName(name: string): string {
  const clean = name.replace(/[\u0000-\u001f\u007f]/g, "").trim();
  return `"${clean.length > 80 ? `${clean.slice(0, 77)}…` : clean || "unnamed file"}"`;
}

/** What a file seems to be, from its declared type (or, without one, its ending). */
export function seemsToBe(file: Picked): string {
  const t = file.type.toLowerCase();
  if (t.startsWith("video/") || (!t && VIDEO_EXT.test(file.name))) return "a video";
  if (HEIC.test(t) || HEIC.test(file.name)) return "a HEIC photo";
  if (t.startsWith("image/")) return `a ${t.slice(6).toUpperCase()} image`;
  if (t.startsWith("audio/")) return "a sound recording";
  if (t === "application/pdf" || /\.pdf$/i.test(file.name)) return "a PDF document";
  if (t.startsWith("text/")) return "a text file";
  const ext = /\.([A-Za-z0-9]{1,8})$/.exec(file.name)?.[1];
  return ext ? `a .${ext.toLowerCase()} file` : "a file of a kind we can't tell";
}

/** null when the file can go in a photo set; else a message naming it and saying what is accepted. */
export function photoFileProblem(file: Picked): string | null {
  const ok = file.type ? PHOTO_TYPES.has(file.type.toLowerCase()) : PHOTO_EXT.test(file.name);
  if (ok) return null;
  const what = seemsToBe(file);
  const hint = what === "a HEIC photo" ? " Most phones convert HEIC to JPEG when the photo is picked from the gallery, or the camera can be set to save JPEG." : "";
  return `${shownName(file.name)} is ${what}, not a photo we can take. ${PHOTO_ACCEPTED}${hint}`;
}

/** null when the file can be posted as a clip; else a message naming it and saying what is accepted. */
export function clipFileProblem(file: Picked): string | null {
  const ok = file.type ? file.type.toLowerCase().startsWith("video/") : VIDEO_EXT.test(file.name);
  if (ok) return null;
  return `${shownName(file.name)} is ${seemsToBe(file)}, not a video. ${CLIP_ACCEPTED}`;
}
