import type { Metadata } from "next";
import { Alert, ButtonLink, Card } from "@/components/ui";
import { getActor } from "@/lib/server/actor";
import { linkRequestSchema } from "@/lib/schemas/auth";
import { SIGN_IN_FAILURES, type SignInFailureCode } from "@/lib/server/sign-in";
import { OwnerLinkForm } from "./_components/owner-form";
import { StaffSignInForm } from "./_components/staff-form";

export const metadata: Metadata = { title: "Sign in" };

type Props = { searchParams: Promise<{ next?: string; code?: string; error?: string; "signed-out"?: string; password?: string; joined?: string }> };

export default async function SignInPage({ searchParams }: Props) {
  const params = await searchParams;
  const next = linkRequestSchema.shape.next.safeParse(params.next).data;
  const actor = await getActor();
  // next-auth sends people back here with ?error=…&code=… when a redirect-based sign-in fails.
  const code = params.code && params.code in SIGN_IN_FAILURES ? SIGN_IN_FAILURES[params.code as SignInFailureCode] : null;

  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold sm:text-3xl">Sign in to Benchside</h1>
      {code ? <Alert tone="error">{code}</Alert> : params.error ? <Alert tone="error">Sign-in failed. Try again.</Alert> : null}
      {params["signed-out"] === "everywhere" && !actor ? <Alert tone="success">You&apos;re signed out on every device and browser.</Alert> : null}
      {params.password === "changed" ? <Alert tone="success">Your password is changed and you&apos;re signed out everywhere. Sign in with the new password.</Alert> : null}
      {params.joined === "1" ? <Alert tone="success">You&apos;ve joined the shop. Sign in with your e-mail address and password.</Alert> : null}
      {actor ? (
        <Alert tone="info" action={<ButtonLink href="/">Continue</ButtonLink>}>
          You&apos;re signed in as {actor.email}.
        </Alert>
      ) : null}
      <div className="grid gap-6 md:grid-cols-2">
        <Card as="section" title="Shop staff" headingId="staff-heading" description="Technicians, service writers and shop owners.">
          <StaffSignInForm next={next} />
        </Card>
        <Card as="section" title="Machine owners" headingId="owners-heading" description="Follow your machine's job and answer the shop.">
          <OwnerLinkForm next={next} />
        </Card>
      </div>
    </div>
  );
}
