"use client";
import { useActionState } from "react";
import { LogOut } from "lucide-react";
import { signOutAction } from "@/app/(auth)/sign-in/actions";
import { Button } from "@/components/ui";

export function SignOutButton({ email }: { email: string }) {
  const [, action, pending] = useActionState(signOutAction, null);
  return (
    <form action={action}>
      <Button type="submit" variant="ghost" loading={pending} icon={<LogOut aria-hidden className="size-5" />} aria-label={`Sign out ${email}`}>
        <span className="hidden sm:inline">Sign out</span>
      </Button>
    </form>
  );
}
