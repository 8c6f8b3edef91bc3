import { NextRequest, NextResponse } from "next/server";
import { toErrorBody } from "@/lib/error-body";
import { handlers } from "@/lib/server/auth";
import { CLOSE_AFTER_REFUSAL, cappedRequest } from "@/lib/server/body-limit";

// Auth.js reads a POST body whole; its forms are a few hundred bytes, so the body is capped while
// it streams: a declared size over the cap is a 413 at once, and a body that turns out larger
// breaks Auth.js's read, which it answers with 400.
const AUTH_MAX_BODY_BYTES = 64 * 1024;

export const GET = handlers.GET;

export async function POST(req: NextRequest) {
  let capped: Request;
  try {
    capped = cappedRequest(req, AUTH_MAX_BODY_BYTES);
  } catch (error) {
    const { status, body } = toErrorBody(error);
    return NextResponse.json(body, { status, headers: CLOSE_AFTER_REFUSAL });
  }
  return handlers.POST(new NextRequest(capped));
}
