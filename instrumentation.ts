// Runs once when the server starts, before it answers requests (Next's instrumentation hook).
export async function register() {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    // Forwarded headers are believed only from proxies we were told about (TRUSTED_PROXY_HOPS);
    // see lib/server/client-ip.ts.
    const { installForwardedHeaderGuard } = await import("./lib/server/client-ip");
    installForwardedHeaderGuard();
  }
}

/**
 * Next's hook for errors thrown while rendering or handling a request: a page that found the
 * database gone tells lib/server/db-health.ts, so the next visitor gets a real 503 from the
 * proxy (an error boundary can't change the status of a page already being rendered).
 */
export async function onRequestError(error: unknown) {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { isDatabaseUnavailable } = await import("./lib/errors");
  if (!isDatabaseUnavailable(error)) return;
  const { reportDatabaseUnavailable } = await import("./lib/server/db-health");
  reportDatabaseUnavailable();
}
