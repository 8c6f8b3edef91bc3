// Runs once when the server starts, before it answers requests (Next's instrumentation hook).
export async function register() {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    // Forwarded headers are believed only from proxies we were told about (TRUSTED_PROXY_HOPS);
    // see lib/server/client-ip.ts.
    const { installForwardedHeaderGuard } = await import("./lib/server/client-ip");
    installForwardedHeaderGuard();
  }
}
