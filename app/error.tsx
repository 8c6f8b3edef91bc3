"use client";

import { AppStyles } from "@/app/app-styles";
import { ErrorScreen } from "@/components/error-screen";

// A screen below the root layout failed: say so plainly, and name the database when it is down.
export default function ErrorPage({ error, retry }: { error: unknown; retry: () => void }) {
  return (
    <>
      <AppStyles />
      <ErrorScreen error={error} retry={retry} />
    </>
  );
}
