import type { Metadata } from "next";
import { headers } from "next/headers";
import { Alert, ButtonLink } from "@/components/ui";
import { AppError } from "@/lib/errors";
import { ROLE_LABEL } from "@/lib/permissions";
import { acceptInviteSchema } from "@/lib/schemas/staff";
import { clientIp } from "@/lib/server/client-ip";
import { INVITE_REFUSALS, viewInvite } from "@/lib/server/staff-invites";
import { JoinForm } from "./join-form";

export const metadata: Metadata = { title: "Join a shop" };

/** The page an invitation e-mail links to. Looking at it uses nothing up; the button does. */
export default async function JoinPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const token = acceptInviteSchema.shape.token.safeParse((await searchParams).token);
  let found: Awaited<ReturnType<typeof viewInvite>> | { ok: false; reason: "limited"; message: string } = { ok: false, reason: "unknown" };
  if (token.success) {
    try {
      found = await viewInvite({ token: token.data, ip: clientIp(await headers()) });
    } catch (error) {
      if (!(error instanceof AppError && error.code === "rate_limited")) throw error;
      found = { ok: false, reason: "limited", message: error.message };
    }
  }
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-bold">Join a shop on Benchside</h1>
      {found.ok ? (
        <>
          <p>
            <strong>{found.invite.shopName}</strong> invites <strong>{found.invite.email}</strong> to join as {ROLE_LABEL[found.invite.role].toLowerCase()}.
            {found.invite.hasPassword ? " You already have a Benchside password: keep using it to sign in after joining." : null}
          </p>
          <JoinForm token={token.data!} name={found.invite.name} email={found.invite.email} needsPassword={!found.invite.hasPassword} />
        </>
      ) : (
        <Alert tone="error" action={<ButtonLink href="/sign-in">Go to sign-in</ButtonLink>}>
          {found.reason === "limited" ? found.message : INVITE_REFUSALS[found.reason]}
        </Alert>
      )}
    </div>
  );
}
