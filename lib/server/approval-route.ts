import "server-only";
import { NextResponse } from "next/server";
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
