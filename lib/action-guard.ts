// Server actions are POSTs that Next decodes before our wrapper (lib/action.ts) runs, and Next
// answers 500 to a foreign Origin, an over-size body or an envelope it can't decode. The proxy
// screens them first with this, so each of those gets a 4xx with our usual error body instead.
// No server-only imports: proxy.ts runs it.

/** Next's own limit for an action body: next.config.mjs `serverActions.bodySizeLimit` ("6mb", for a logo). */
export const ACTION_BODY_LIMIT = 6 * 1024 * 1024;

type ErrorAnswer = { status: number; code: string; message: string };

const refusal = (status: number, code: string, message: string): ErrorAnswer => ({ status, code, message });
const unreadable = () => refusal(400, "bad_request", "The form could not be read (cut short or malformed).");

export type ActionRefusalOptions = {
  /**
   * The path may be a page: Next then also treats any multipart POST to it as a possible no-JS
   * form action (`$ACTION_ID_…` / `$ACTION_REF_…` fields) and decodes it with the same checks.
   * False for route-handler paths, which Next never decodes as actions.
   */
  page?: boolean;
};

/**
 * Why a server-action request must be refused before Next decodes it, or null when it may go on.
 * `ownOrigins`: the app's origins (APP_URL and the request's own). Every Benchside action takes a
 * form, so a real one is always multipart/form-data with a known length.
 */
export async function actionRefusal(request: Request, ownOrigins: ReadonlySet<string>, { page = true }: ActionRefusalOptions = {}): Promise<ErrorAnswer | null> {
  if (request.method !== "POST") return null;
  const fetchAction = request.headers.has("next-action");
  // Next's own test for a possible form action is this exact, case-sensitive prefix.
  const formPost = page && (request.headers.get("content-type") ?? "").startsWith("multipart/form-data");
  if (!fetchAction && !formPost) return null;
  const site = request.headers.get("sec-fetch-site");
  const origin = request.headers.get("origin");
  if ((site && site !== "same-origin" && site !== "none") || (origin !== null && (!ownOrigins.has(origin) || new URL(origin).host !== hostOf(request)))) {
    return refusal(403, "forbidden", "Requests from other sites are refused.");
  }
  // Exactly as Next tests it (case-sensitive): anything else it would decode as a JSON reply.
  if (!(request.headers.get("content-type") ?? "").startsWith("multipart/form-data")) return refusal(415, "unsupported_media_type", "Send the form as multipart/form-data.");
  const length = request.headers.get("content-length");
  if (length === null || !/^\d{1,12}$/.test(length)) return refusal(411, "length_required", "Send the form with its length (Content-Length).");
  if (Number(length) > ACTION_BODY_LIMIT) return refusal(413, "too_large", "The form is too large (6 MB at most; job photos go through their own upload).");
  let form: FormData;
  try {
    // The proxy reads its own copy of the body; the action still gets the original.
    form = await request.clone().formData();
  } catch {
    return unreadable();
  }
  return fetchAction ? argumentsProblem(form) : formActionProblem(form);
}

/**
 * The host Next compares the Origin with (x-forwarded-host first, then Host): a mismatch there is
 * Next's own CSRF refusal, which it answers with a 500.
 */
function hostOf(request: Request): string {
  const forwarded = request.headers.get("x-forwarded-host")?.split(",")[0]?.trim();
  return forwarded || request.headers.get("host") || new URL(request.url).host;
}

// A fetch action's arguments are React's reply encoding: field "0" is the JSON array of the
// arguments, in which a string starting with "$" refers to another part ("$K1": the form's
// fields, sent as "_1_<name>"), and a literal "$…" string is escaped as "$$…". Our actions take
// (previous state, form); the previous state is plain JSON. A reference to a part that isn't
// there, or a root that isn't an array, makes Next's decoder throw (a 500): refused here.
// Values that stand alone: a literal, a date, a BigInt (React refuses over 300 digits), the form.
const VALUE_TOKENS = /^\$(?:\$.*|K[0-9a-f]+|D.*|n-?\d{1,300}|undefined|NaN|Infinity|-Infinity|-0)$/s;

function plainArguments(value: unknown, depth = 0): boolean {
  if (depth > 64) return false;
  if (typeof value === "string") return !value.startsWith("$") || VALUE_TOKENS.test(value);
  if (Array.isArray(value)) return value.every((v) => plainArguments(v, depth + 1));
  if (value && typeof value === "object") return Object.values(value).every((v) => plainArguments(v, depth + 1));
  return true;
}

function argumentsProblem(form: FormData): ErrorAnswer | null {
  const root = form.get("0");
  if (typeof root !== "string") return unreadable();
  let args: unknown;
  try {
    args = JSON.parse(root);
  } catch {
    return unreadable();
  }
  return Array.isArray(args) && plainArguments(args) ? null : unreadable();
}

/** A no-JS form action names itself in `$ACTION_…` fields whose values React parses as JSON. */
function formActionProblem(form: FormData): ErrorAnswer | null {
  for (const [key, value] of form.entries()) {
    if (!key.startsWith("$ACTION_") || key.startsWith("$ACTION_ID_")) continue;
    if (key.startsWith("$ACTION_REF_") || key === "$ACTION_KEY") continue;
    if (typeof value !== "string") return unreadable();
    try {
      const parsed: unknown = JSON.parse(value);
      if (key.endsWith(":0") && (!parsed || typeof parsed !== "object" || typeof (parsed as { id?: unknown }).id !== "string")) return unreadable();
    } catch {
      return unreadable();
    }
  }
  return null;
}
