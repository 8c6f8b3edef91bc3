import type { ReactNode } from "react";
import { AppHeader } from "@/components/app-header";
import { requirePageActor } from "@/lib/server/authorize";

export default async function OwnerLayout({ children }: { children: ReactNode }) {
  const actor = await requirePageActor("/my");
  return (
    <>
      <AppHeader actor={actor} />
      <main id="main" tabIndex={-1} className="mx-auto max-w-3xl px-4 py-6">
        {children}
      </main>
    </>
  );
}
