"use client";
import useSWR from "swr";
import type { ApprovalsOverview } from "@/lib/approvals-overview";
import { jsonFetcher } from "./fetcher";

/** An open request is answered from the owner's phone: the desk should see it within seconds. */
export const APPROVALS_REFRESH_MS = 5_000;

/** The staff panel's overview of a job's findings and requests, kept fresh while the page is open. */
export function useJobApprovals(jobPublicId: string, initial?: ApprovalsOverview) {
  return useSWR<ApprovalsOverview>(`/api/jobs/${encodeURIComponent(jobPublicId)}/approvals`, jsonFetcher, {
    fallbackData: initial,
    refreshInterval: APPROVALS_REFRESH_MS,
    revalidateOnFocus: true,
  });
}
