// Questions on a job, as both sides read them. Pure, zod-free: client components import it.

export const QUESTION_MAX = 2000;

export type QuestionVia = "page" | "sms" | "email";

export const VIA_LABEL: Record<QuestionVia, string> = {
  page: "on the job page",
  sms: "by text",
  email: "by e-mail",
};

/** One message of a job's thread, as the pages show it (JSON-safe). */
export type ThreadMessage = {
  id: number;
  author: "owner" | "staff";
  /** The owner's name, or the staff member's; null if the person was removed. */
  authorName: string | null;
  body: string;
  via: QuestionVia;
  /** The request line the question is about, when it is about one. */
  line: { requestPublicId: string; no: number; description: string | null } | null;
  answersQuestionId: number | null;
  /** For an owner's question: when the desk answered it (null: still open). */
  answeredAt: string | null;
  at: string;
};

/** Open questions of a thread: the owner's, not yet answered. */
export function openQuestions(thread: readonly ThreadMessage[]): ThreadMessage[] {
  return thread.filter((m) => m.author === "owner" && m.answeredAt === null);
}

/** "About line 2: Drive chain" — how a question names its line. */
export function lineLabel(line: NonNullable<ThreadMessage["line"]>): string {
  return line.description ? `About line ${line.no}: ${line.description}` : `About line ${line.no}`;
}

/** The reply-to address of mail about a job: the token names the job, the domain the shop's inbound mail. */
export function replyAddress(token: string, domain: string): string {
  return `q-${token}@${domain}`;
}

/** The job token of a reply-to address (any case; mail systems may fold it), or null. */
export function tokenOfAddress(address: string): string | null {
  const bare = /<([^>]+)>\s*$/.exec(address)?.[1] ?? address;
  const m = /^q-([a-z2-7]{26})@[^@\s]+$/i.exec(bare.trim());
  return m ? m[1]!.toLowerCase() : null;
}

/** The bare address of a From header ("Ada Marsh <ada@example.test>" → "ada@example.test"), lower-case. */
export function bareAddress(from: string): string {
  return (/<([^>]+)>\s*$/.exec(from)?.[1] ?? from).trim().toLowerCase();
}
