"use client";
import { useActionState } from "react";
import { LogOut, UserRound } from "lucide-react";
import { signOutAction, signOutEverywhereAction } from "@/app/(auth)/sign-in/actions";
import { Button } from "@/components/ui";
import { forgetOfflineCopies } from "@/lib/offline/private-caches";

// Both sign-outs drop the job pages and photos the staff app kept for offline use (lib/offline/).
export function SignOutButton({ email }: { email: string }) {
  const [, action, pending] = useActionState(signOutAction, null);
  return (
    <form action={action} onSubmit={() => void forgetOfflineCopies()}>
      <Button type="submit" variant="ghost" loading={pending} icon={<LogOut aria-hidden className="size-5" />} aria-label={`Sign out ${email}`}>
        <span className="hidden sm:inline">Sign out</span>
      </Button>
    </form>
  );
}

/** Who is signed in, and the way to end every session at once (a lost phone, a shared computer). */
export function AccountMenu({ email }: { email: string }) {
  const [, action, pending] = useActionState(signOutEverywhereAction, null);
  return (
    <details className="relative">
      <summary className="inline-flex min-h-tap min-w-tap cursor-pointer list-none items-center justify-center gap-2 rounded-lg px-3 font-medium text-oil hover:bg-oil-soft [&::-webkit-details-marker]:hidden">
        <UserRound aria-hidden className="size-5" />
        <span className="sr-only sm:not-sr-only">Account</span>
      </summary>
      <div className="absolute right-0 z-20 mt-1 w-72 max-w-[calc(100vw-2rem)] space-y-3 rounded-lg border border-line bg-surface p-4 shadow-lg">
        <p className="break-words text-sm text-ink-muted">
          Signed in as <strong className="text-ink">{email}</strong>
        </p>
        <form action={action} onSubmit={() => void forgetOfflineCopies()}>
          <Button type="submit" variant="secondary" loading={pending} icon={<LogOut aria-hidden className="size-5" />} fullWidth>
            Sign out everywhere
          </Button>
        </form>
        <p className="text-sm text-ink-muted">Ends every session of this account, on every phone and computer, this one included.</p>
      </div>
    </details>
  );
}
