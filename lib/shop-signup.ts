// The "Start your shop" form's pure parts (issue 16 §1): the address rules, the suggestion drawn
// from the name, and which fields the forms show. Free of zod, so the client form can import it.

/**
 * Addresses a shop may not take: words the app's own paths use, or that would look like the
 * service speaking (a shop at /s/admin, /s/support…).
 */
export const RESERVED_SLUGS = new Set([
  "admin", "api", "app", "auth", "benchside", "billing", "help", "inbox", "login", "logout", "my", "new",
  "null", "owner", "public", "root", "s", "security", "settings", "shop", "shops", "sign-in", "sign-out",
  "signin", "signup", "staff", "start", "static", "status", "support", "system", "test", "u", "undefined",
  "unsubscribe", "www", "mail", "email", "about", "terms", "privacy", "_next",
]);

/** lowercase letters, digits and single hyphens, 3 to 40 long, starting and ending with a letter or digit. */
export const SLUG_RULE = /^[a-z0-9](?:[a-z0-9]|-(?!-)){1,38}[a-z0-9]$/;

/** "Kestrel Motor Works!" → "kestrel-motor-works": a suggestion the form fills in from the name. */
export function suggestSlug(name: string): string {
  return name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 40)
    .replace(/-+$/, "");
}

/** What the forms show beside their inputs (lib/schemas/form-fields.ts; the rest goes in the banner). */
export const SHOP_SIGNUP_VISIBLE = ["shopName", "slug", "timezone", "currency", "ownerName", "email", "password"] as const;
export const CONFIRM_SIGNUP_VISIBLE = ["password"] as const;
