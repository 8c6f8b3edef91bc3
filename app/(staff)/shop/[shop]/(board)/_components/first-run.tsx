import Link from "next/link";
import { ArrowRight, CircleCheck, Circle } from "lucide-react";
import { Card } from "@/components/ui";
import type { FirstRun } from "@/db/queries/shop-signup";

/**
 * The owner's first-run checklist (issue 16 §1), on the board until every step is done. Each
 * step is read from the data (db/queries/shop-signup.ts readFirstRun), so it ticks itself.
 * Status is a word plus an icon, never colour alone.
 */
export function FirstRunChecklist({ shopSlug, done }: { shopSlug: string; done: FirstRun }) {
  const steps = [
    { key: "labourRate", ok: done.labourRate, title: "Set your labour rate and tax", href: `/shop/${shopSlug}/settings#settings-labour`, cta: "Open settings" },
    { key: "staff", ok: done.staff, title: "Invite your staff", href: `/shop/${shopSlug}/staff`, cta: "Invite someone" },
    { key: "firstJob", ok: done.firstJob, title: "Check in your first machine", href: `/shop/${shopSlug}/jobs/new`, cta: "Check in" },
  ];
  const left = steps.filter((s) => !s.ok).length;
  return (
    <Card as="section" title="Getting your shop ready" headingId="first-run" description={`${left} of ${steps.length} steps left. This list goes away once they are done.`}>
      <ol className="divide-y divide-line" data-testid="first-run">
        {steps.map((s) => (
          <li key={s.key} className="flex flex-wrap items-center justify-between gap-3 py-2">
            <span className="flex items-center gap-2">
              {s.ok ? <CircleCheck aria-hidden className="size-5 text-moss" /> : <Circle aria-hidden className="size-5 text-ink-muted" />}
              <span className={s.ok ? "text-ink-muted" : "font-semibold text-ink"}>{s.title}</span>
              <span className="text-sm text-ink-muted">{s.ok ? "Done" : "To do"}</span>
            </span>
            {s.ok ? null : (
              <Link href={s.href} className="inline-flex min-h-tap items-center gap-1 font-semibold text-oil underline underline-offset-2 hover:no-underline">
                {s.cta}
                <ArrowRight aria-hidden className="size-4" />
              </Link>
            )}
          </li>
        ))}
      </ol>
    </Card>
  );
}
