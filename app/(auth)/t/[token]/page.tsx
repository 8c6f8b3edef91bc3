import type { Metadata } from "next";
import { peekSignInLink } from "@/db/queries/sign-in";
import { Alert, ButtonLink } from "@/components/ui";
import { linkRequestSchema, linkTokenSchema } from "@/lib/schemas/auth";
import { hashToken } from "@/lib/server/sign-in";
import { LinkSignInForm } from "../../sign-in/link/link-form";

export const metadata: Metadata = { title: "Open your request", robots: { index: false } };

/**
 * /t/<token>: the short link in a text (lib/server/texts.ts textLinkTo). Reading it uses nothing up
 * (link previews open it too); the button signs in once through the same sign-in-link action as the
 * e-mailed links and lands on the request. Used or expired, the normal sign-in comes back to it.
 */
export default async function TextLinkPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const valid = linkTokenSchema.shape.token.safeParse(token);
  const found = valid.success ? await peekSignInLink({ tokenHash: hashToken(valid.data) }) : null;
  const next = linkRequestSchema.shape.next.safeParse(found?.nextPath ?? undefined).data;
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-bold">Open your request</h1>
      {found?.usable ? (
        <>
          <p>This link from the shop&apos;s text signs you in on this phone and opens what they sent you.</p>
          <LinkSignInForm token={valid.data!} next={next} />
        </>
      ) : (
        <Alert tone="error" action={<ButtonLink href={next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in"}>Sign in with your e-mail</ButtonLink>}>
          {found ? "This link has been used or has expired. Sign in with your e-mail address to see the request." : "This link isn't complete or isn't ours. Open it again from the text, or sign in with your e-mail address."}
        </Alert>
      )}
    </div>
  );
}
