import "server-only";

/** The app's public address, for links in e-mails. */
export function appUrl(): string {
  return (process.env.APP_URL ?? `http://localhost:${process.env.PORT ?? 3000}`).replace(/\/$/, "");
}
