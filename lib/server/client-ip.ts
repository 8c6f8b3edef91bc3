/**
 * The client's network address for the per-address sign-in limits. Behind N trusted proxies
 * (TRUSTED_PROXY_HOPS=N) it is the entry the outermost one appended to X-Forwarded-For;
 * entries to its left were written by the client and can't be believed. Reached directly,
 * Next fills the header from the socket unless the client sent one, so there the limits per
 * e-mail address are the ones that hold; run behind a proxy in production (README).
 */
export function clientIp(headers: Headers): string {
  const hops = Math.max(1, Number(process.env.TRUSTED_PROXY_HOPS) || 1);
  const chain = (headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map((part) => part.trim())
    .filter(Boolean);
  return chain[chain.length - hops] ?? chain[0] ?? "unknown";
}
