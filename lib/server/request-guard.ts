import "server-only";
import { AppError } from "@/lib/errors";
import { appUrl } from "@/lib/server/config";

// Cross-site request forgery and masked bodies, refused before anything is read. A browser
// sends `Origin` (and `Sec-Fetch-Site`) on every state-changing fetch or form post; a page on
// another port of the same host is same-*site* but not same-*origin*, and SameSite=Lax cookies
// ride along, so only the exact origin of the app passes. Clients that send neither header are
// not browsers and carry no victim's cookie.

/** The origins this app answers as: APP_URL, and the address the request was made to. */
function ownOrigins(url: URL): Set<string> {
  const origins = new Set<string>([url.origin]);
  try {
    origins.add(new URL(appUrl()).origin);
  } catch {
    // A malformed APP_URL leaves only the request's own origin.
  }
  return origins;
}

export function crossSiteRefusal(headers: Headers, url: URL): AppError | null {
  const site = headers.get("sec-fetch-site");
  if (site && site !== "same-origin" && site !== "none") return new AppError("forbidden", "Requests from other sites are refused.");
  const origin = headers.get("origin");
  if (origin !== null && !ownOrigins(url).has(origin)) return new AppError("forbidden", "Requests from other sites are refused.");
  return null;
}

/** The declared media type must be exactly the expected one (`text/plain;charset=application/json` is not JSON). */
export function mediaTypeRefusal(headers: Headers, expected: "application/json" | "multipart/form-data"): AppError | null {
  const essence = (headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (essence === expected) return null;
  return new AppError("unsupported_media_type", `Send ${expected === "application/json" ? "JSON (Content-Type: application/json)" : "a multipart form (Content-Type: multipart/form-data)"}.`);
}
