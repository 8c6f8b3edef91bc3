"use client";
import useSWR from "swr";
import type { JobBoardPage } from "@/lib/jobs-view";
import type { JobListQuery } from "@/lib/schemas/jobs";
import { jsonFetcher } from "./fetcher";
import { useFallbackRefreshInterval } from "./use-live-events";

/** The query as URL search params, leaving defaults out so links stay short. */
export function jobQueryToSearch(query: JobListQuery): string {
  const p = new URLSearchParams();
  if (query.q) p.set("q", query.q);
  if (query.status.length) p.set("status", query.status.join(","));
  if (query.attention.length) p.set("attention", query.attention.join(","));
  if (query.technician) p.set("technician", String(query.technician));
  if (query.sort !== "updated") p.set("sort", query.sort);
  if (query.dir !== "desc") p.set("dir", query.dir);
  if (query.page !== 1) p.set("page", String(query.page));
  if (query.pageSize !== 25) p.set("pageSize", String(query.pageSize));
  return p.toString();
}

export function useJobBoard(shopSlug: string, query: JobListQuery, initial?: { search: string; data: JobBoardPage }) {
  const search = jobQueryToSearch(query);
  const fallbackData = initial && initial.search === search ? initial.data : undefined;
  // The shop's live stream refetches the board on every event; it polls only while that is down.
  const refreshInterval = useFallbackRefreshInterval();
  return useSWR<JobBoardPage>(`/api/shops/${encodeURIComponent(shopSlug)}/jobs?${search}`, jsonFetcher, {
    fallbackData,
    // The server already rendered this page: no second fetch on arrival, only on focus or change.
    revalidateOnMount: !fallbackData,
    keepPreviousData: true,
    revalidateOnFocus: true,
    refreshInterval,
  });
}
