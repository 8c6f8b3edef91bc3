"use client";

import { AppStyles } from "@/app/app-styles";
import { ErrorScreen } from "@/components/error-screen";

// The root layout itself failed: this replaces it, so it brings its own document and styles.
export default function GlobalError({ error, retry }: { error: unknown; retry: () => void }) {
  return (
    <html lang="en">
      <body className="min-h-dvh">
        <title>Benchside</title>
        <AppStyles />
        <ErrorScreen error={error} retry={retry} />
      </body>
    </html>
  );
}
