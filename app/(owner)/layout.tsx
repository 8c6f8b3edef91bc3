import { connection } from "next/server";
import type { ReactNode } from "react";
import { AppStyles } from "@/app/app-styles";

// The machine owner's area is rendered per request: every page's scripts carry that request's
// CSP nonce (proxy.ts). (The root layout leaves this to each area, so the public pages can be cached.)
export default async function OwnerAreaLayout({ children }: { children: ReactNode }) {
  await connection();
  return (
    <>
      <AppStyles />
      {children}
    </>
  );
}
