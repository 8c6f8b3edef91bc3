import type { Metadata } from "next";
import { Alert, ButtonLink } from "@/components/ui";
import { linkRequestSchema, linkTokenSchema } from "@/lib/schemas/auth";
import { LinkSignInForm } from "./link-form";

export const metadata: Metadata = { title: "Sign in with your link" };

export default async function LinkPage({ searchParams }: { searchParams: Promise<{ token?: string; next?: string }> }) {
  const params = await searchParams;
  const token = linkTokenSchema.shape.token.safeParse(params.token);
  const next = linkRequestSchema.shape.next.safeParse(params.next).data;
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-bold">Sign in to follow your job</h1>
      {token.success ? (
        <LinkSignInForm token={token.data} next={next} />
      ) : (
        <Alert tone="error" action={<ButtonLink href="/sign-in">Ask for a new link</ButtonLink>}>
          This sign-in link is incomplete. Open it again from the e-mail, or ask for a new one.
        </Alert>
      )}
    </div>
  );
}
