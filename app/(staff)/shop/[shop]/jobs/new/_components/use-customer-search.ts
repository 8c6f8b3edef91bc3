"use client";
import { useEffect, useState } from "react";
import useSWR from "swr";
import type { CustomerSearchResult } from "@/lib/schemas/check-in";
import { jsonFetcher } from "@/lib/swr/fetcher";

/** The shop's owners matching what is typed, asked once typing pauses. */
export function useCustomerSearch(shopSlug: string, text: string) {
  const [q, setQ] = useState(text.trim());
  useEffect(() => {
    const t = setTimeout(() => setQ(text.trim()), 250);
    return () => clearTimeout(t);
  }, [text]);
  const result = useSWR<{ customers: CustomerSearchResult[] }>(
    `/api/shops/${encodeURIComponent(shopSlug)}/customers?${new URLSearchParams({ q })}`,
    jsonFetcher,
    { keepPreviousData: true, revalidateOnFocus: false },
  );
  return { ...result, settled: q === text.trim() };
}
