import { Card } from "@/components/ui";
import { QuestionThread } from "@/components/questions/question-thread";
import { type Actor, type Resource, can } from "@/lib/permissions";
import { jobThread } from "@/lib/server/questions";
import { AskForm } from "./ask-form";

/**
 * The owner's questions to the shop and its answers, with a box to ask. Only the machine's owner
 * sees it: a question may be about prices, which followers never see.
 */
export async function QuestionsCard({ actor, job, resource, shopName, timeZone }: { actor: Actor; job: { id: number; shopId: number; publicId: string }; resource: Resource; shopName: string; timeZone: string }) {
  if (!can(actor, "questions:ask", resource)) return null;
  const thread = await jobThread({ shopId: job.shopId, jobId: job.id });
  return (
    <Card as="section" title="Questions for the shop" headingId="questions" description="Ask anything about the work; to ask about a line of a request, open the request.">
      <div className="space-y-4">
        {thread.length ? (
          <QuestionThread thread={thread} timeZone={timeZone} viewer="owner" shopName={shopName} requestHref={(r) => `/my/jobs/${job.publicId}/approvals/${r}`} />
        ) : (
          <p className="text-ink-muted">No questions yet.</p>
        )}
        <AskForm jobPublicId={job.publicId} />
      </div>
    </Card>
  );
}
