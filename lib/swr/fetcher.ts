/** SWR fetcher for our JSON routes: throws the route's own error message on a non-2xx answer. */
export class FetchError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

export async function jsonFetcher<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
  if (!res.ok) throw new FetchError(body?.error?.message ?? `Request failed (${res.status})`, res.status);
  return body as T;
}

/**
 * For writes from client components: JSON in, JSON out, the route's own error message on failure.
 * The editors that use it have no field of their own for each key they send, so per-field messages
 * are said in the message (a bare "Some fields need attention." would point at nothing).
 */
export async function sendJson<T>(url: string, method: "POST" | "PATCH" | "DELETE", body: unknown): Promise<T> {
  const res = await fetch(url, { method, headers: { "content-type": "application/json", accept: "application/json" }, body: JSON.stringify(body) });
  const data = (await res.json().catch(() => null)) as { error?: { message?: string; fields?: Record<string, string[]> } } | null;
  if (!res.ok) {
    const said = [...new Set(Object.values(data?.error?.fields ?? {}).map((messages) => messages[0]))].filter(Boolean);
    throw new FetchError(said.length ? said.join(" ") : (data?.error?.message ?? `Request failed (${res.status})`), res.status);
  }
  return data as T;
}
