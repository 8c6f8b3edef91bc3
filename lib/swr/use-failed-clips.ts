"use client";
import useSWR from "swr";
import type { FailedClip } from "@/lib/clips";
import { jsonFetcher } from "./fetcher";

/** How often the list is asked again while a clip of the page is still on its way, and otherwise. */
export const FAILED_CLIPS_FAST_MS = 3_000;
export const FAILED_CLIPS_SLOW_MS = 30_000;

/**
 * The job's clips the video service rejected (staff only): they leave the timeline, so this list
 * is where the bench learns why. Asked often while a clip is uploading or processing.
 */
export function useFailedClips(jobPublicId: string, clipsPending: boolean) {
  return useSWR<{ clips: FailedClip[] }>(`/api/jobs/${encodeURIComponent(jobPublicId)}/clips/failed`, jsonFetcher, {
    refreshInterval: clipsPending ? FAILED_CLIPS_FAST_MS : FAILED_CLIPS_SLOW_MS,
    revalidateOnFocus: true,
  });
}
