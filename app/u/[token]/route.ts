import { z } from "zod";
import { route } from "@/lib/route";
import { unsubscribeWithToken } from "@/lib/server/following";

const tokenParams = z.object({ token: z.string().max(400) });

const plain = (status: number, text: string) =>
  new Response(text, { status, headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store", "x-content-type-options": "nosniff" } });

/**
 * POST /u/:token — one-click unsubscribe, the address in every subscriber mail's
 * List-Unsubscribe header. RFC 8058 §3.2: the mail client POSTs "List-Unsubscribe=One-Click"
 * with no cookies and follows no redirect, so the token alone decides and the answer is a
 * plain 200. A forged or damaged token changes nothing (400); a removed subscriber gets 404.
 */
export const POST = route({ params: tokenParams, permission: "public", crossSite: "allow" }, async ({ params }) => {
    const result = await unsubscribeWithToken(params.token);
    if (result === "invalid") return plain(400, "This unsubscribe link isn't valid. Use the link from the e-mail as it is.");
    if (result === "gone") return plain(404, "There is no subscription behind this link any more: you get no e-mail about this job.");
  return plain(200, "Done: you won't get any more e-mail about this job. You can start them again from the job page.");
});

/**
 * GET /u/:token — a person (or a link scanner) opening the address: never unsubscribes by
 * itself, only shows the page with the button that does.
 */
export const GET = route({ params: tokenParams, permission: "public" }, async ({ params, req }) => {
  const url = req.nextUrl.clone();
  url.pathname = `/unsubscribe/${encodeURIComponent(params.token)}`;
  url.search = "";
  return Response.redirect(url, 303);
});
