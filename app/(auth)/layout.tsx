import { connection } from "next/server";
import type { ReactNode } from "react";
import { AppStyles } from "@/app/app-styles";
import { Brand } from "@/components/brand";

export default async function AuthLayout({ children }: { children: ReactNode }) {
  // Rendered per request: the page's scripts carry this request's CSP nonce (proxy.ts).
  await connection();
  return (
    <div className="flex min-h-dvh flex-col">
      <AppStyles />
      <header className="border-b border-line px-4 py-3">
        <Brand />
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-3xl flex-1 px-4 py-6 sm:py-10">
        {children}
      </main>
    </div>
  );
}
