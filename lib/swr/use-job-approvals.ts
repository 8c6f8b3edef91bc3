"use client";
import useSWR from "swr";
import type { ApprovalsOverview } from "@/lib/approvals-overview";
import type { WithoutMoney } from "@/lib/money-fields";
import { jsonFetcher } from "./fetcher";

/** An open request is answered from the owner's phone: the desk should see it within seconds. */
export const APPROVALS_REFRESH_MS = 5_000;

/**
 * The staff panel's overview of a job's findings and requests, kept fresh while the page is open.
 * Typed without money: a technician's copy comes without amounts (the route strips them); the
 * panel reads amounts only when it was told the reader may see them.
 */
export function useJobApprovals(jobPublicId: string, initial?: WithoutMoney<ApprovalsOverview>) {
  return useSWR<WithoutMoney<ApprovalsOverview>>(`/api/jobs/${encodeURIComponent(jobPublicId)}/approvals`, jsonFetcher, {
    fallbackData: initial,
    refreshInterval: APPROVALS_REFRESH_MS,
    revalidateOnFocus: true,
  });
}
