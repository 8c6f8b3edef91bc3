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
