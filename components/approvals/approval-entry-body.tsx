import Link from "next/link";
import { CircleCheck, MessageCircleQuestionMark, Undo2 } from "lucide-react";
import { type DecisionMethod, METHOD_LABEL } from "@/lib/approvals";

// A timeline entry of kind "approval". Its body never holds prices (followers read the timeline
// too): what was asked, how it was answered, and a link to the request, where the job's staff and
// owner see the prices.

type ApprovalBody = {
  event: "sent" | "answered" | "withdrawn";
  request: string;
  title: string;
  version: number;
  lines?: number;
  replaces?: string | null;
  approved?: number;
  declined?: number;
  method?: DecisionMethod;
  by?: string;
  reason?: string | null;
};

export function isApprovalBody(body: unknown): body is ApprovalBody {
  const b = body as ApprovalBody | null;
  return !!b && typeof b === "object" && ["sent", "answered", "withdrawn"].includes(b.event) && typeof b.request === "string" && typeof b.title === "string";
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? "" : "s"}`;

export function ApprovalEntryBody({ body, showLink = true }: { body: unknown; showLink?: boolean }) {
  if (!isApprovalBody(body)) return null;
  const link = showLink ? (
    <Link href={`/my/approvals/${body.request}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2">
      Open the request
    </Link>
  ) : null;
  if (body.event === "sent") {
    return (
      <div className="space-y-1">
        <p className="flex items-start gap-2 font-semibold text-ink">
          <MessageCircleQuestionMark aria-hidden className="mt-0.5 size-5 shrink-0 text-brass" />
          <span>Asked for the owner&apos;s OK: {body.title}</span>
        </p>
        <p>
          {body.version > 1 ? `Revised request (version ${body.version}), replacing the earlier one. ` : ""}
          {body.lines ? `${plural(body.lines, "line")} to approve or decline.` : null}
        </p>
        {link}
      </div>
    );
  }
  if (body.event === "answered") {
    const how = body.method && body.method !== "online" ? ` (${METHOD_LABEL[body.method].toLowerCase()}, noted by the shop)` : "";
    return (
      <div className="space-y-1">
        <p className="flex items-start gap-2 font-semibold text-ink">
          <CircleCheck aria-hidden className="mt-0.5 size-5 shrink-0 text-moss" />
          <span>
            {body.by ?? "The owner"} answered{how}: {body.title}
          </span>
        </p>
        <p>
          {plural(body.approved ?? 0, "line")} approved, {plural(body.declined ?? 0, "line")} declined.
        </p>
        {link}
      </div>
    );
  }
  return (
    <div className="space-y-1">
      <p className="flex items-start gap-2 font-semibold text-ink">
        <Undo2 aria-hidden className="mt-0.5 size-5 shrink-0 text-ink-muted" />
        <span>The shop withdrew the request: {body.title}</span>
      </p>
      {body.reason ? <p className="whitespace-pre-line">{body.reason}</p> : null}
    </div>
  );
}
