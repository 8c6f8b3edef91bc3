import { Card } from "@/components/ui";
import { QuestionThread } from "@/components/questions/question-thread";
import { openQuestions } from "@/lib/questions";
import { type Actor, type Resource, can } from "@/lib/permissions";
import { jobThread } from "@/lib/server/questions";
import { AnswerQuestionForm } from "./answer-question-form";

/** The owner's questions on this job and the desk's answers; the desk answers each open one here. */
export async function StaffQuestionsCard({ actor, resource, job, shopName, timeZone }: { actor: Actor; resource: Resource; job: { id: number; shopId: number; publicId: string }; shopName: string; timeZone: string }) {
  const thread = await jobThread({ shopId: job.shopId, jobId: job.id });
  if (!thread.length) return null;
  const mayAnswer = can(actor, "questions:answer", resource);
  const open = openQuestions(thread).length;
  return (
    <Card as="section" title="Questions from the owner" headingId="questions" description={open ? `${open} waiting for an answer.` : "All answered."}>
      <QuestionThread
        thread={thread}
        timeZone={timeZone}
        viewer="shop"
        shopName={shopName}
        requestHref={(r) => `/my/jobs/${job.publicId}/approvals/${r}`}
        renderAnswer={mayAnswer ? (q) => <AnswerQuestionForm jobPublicId={job.publicId} questionId={q.id} /> : undefined}
      />
    </Card>
  );
}
