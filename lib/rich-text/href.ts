// Link checks shared by the editor, the note schema and the renderer. Kept free of tiptap and
// zod so the read-only view can import it without pulling the editor into the owner's bundle.

export const LINK_PROTOCOLS = ["http:", "https:", "mailto:"] as const;

export const HREF_MAX_LENGTH = 2048;

export const LINK_RULE_MESSAGE = "Links must start with http://, https:// or mailto:";

// Control characters: browsers strip some of them inside a scheme ("java\tscript:"), so we
// refuse them outright rather than reason about each one. Plain spaces are percent-encoded by URL.
const UNSAFE_CHARS = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;

/**
 * The normalised href if it is an absolute http(s) or mailto URL we are happy to render,
 * otherwise null. Allow-list, not block-list: anything unrecognised (javascript:, data:,
 * vbscript:, relative paths) is refused (OWASP XSS Prevention Cheat Sheet, rule on URL contexts).
 */
export function safeHref(raw: unknown): string | null {
  if (typeof raw !== "string" || raw.length === 0 || raw.length > HREF_MAX_LENGTH) return null;
  if (UNSAFE_CHARS.test(raw)) return null;
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    return null;
  }
  if (!(LINK_PROTOCOLS as readonly string[]).includes(url.protocol)) return null;
  if (url.protocol === "mailto:") return url.pathname.includes("@") ? url.href : null;
  // user:password@host hides the real destination ("https://bank.test@evil.test"): common practice to refuse.
  if (!url.hostname || url.username || url.password) return null;
  return url.href;
}

/** What someone typed into the link box: adds https:// to a bare "parts.example.test/page". */
export function hrefFromInput(typed: string): string | null {
  const value = typed.trim();
  if (!value) return null;
  if (/^[a-z][a-z0-9+.-]*:/i.test(value)) return safeHref(value);
  // Relative paths mean nothing outside our own pages.
  if (/^[/.#?]/.test(value)) return null;
  if (/^[^\s/@]+@[^\s/@]+\.[^\s/@]+$/.test(value)) return safeHref(`mailto:${value}`);
  return safeHref(`https://${value}`);
}
