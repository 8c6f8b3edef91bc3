import "server-only";
import { NextResponse } from "next/server";
import { AppError } from "@/lib/errors";
import { ApprovalRefusal } from "@/lib/server/approvals";

/**
 * Runs an approval action; a refusal is answered with the usual error body plus what to show
 * instead (`refusal.current`: the version to answer; `refusal.decision`: the answer on record).
 */
export async function withRefusal<T>(run: () => Promise<T>): Promise<T | Response> {
  try {
    return await run();
  } catch (error) {
    if (!(error instanceof ApprovalRefusal)) throw error;
    return NextResponse.json({ error: { code: error.code, message: error.message }, refusal: error.details }, { status: error.status });
  }
}

/** Path ids of findings: positive whole numbers, anything else is a 404. */
export function findingIdParam(raw: string): number {
  if (!/^[1-9]\d{0,15}$/.test(raw)) throw new AppError("not_found", "No such finding.");
  return Number(raw);
}
