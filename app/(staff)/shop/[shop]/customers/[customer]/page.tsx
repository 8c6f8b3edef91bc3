import type { Metadata } from "next";
import Link from "next/link";
import { Search } from "lucide-react";
import { Button, Card, Field, Input, PageHeader } from "@/components/ui";
import { getCustomerDetail, listCustomers } from "@/db/queries/customers";
import { CONTACT_PREFERENCE_LABEL } from "@/lib/customers";
import { MACHINE_KIND_LABEL, describeMachine } from "@/lib/machine";
import { can } from "@/lib/permissions";
import { loadPage } from "@/lib/server/page-access";
import { JobsTable, LINK_CLASS } from "../_components/jobs-table";
import { ContactForm } from "./_components/contact-form";
import { type MergeCandidate, MergeForm } from "./_components/merge-form";

export const metadata: Metadata = { title: "Customer" };

const link = LINK_CLASS;

/** One customer: how to reach them, their machines and jobs; the desk corrects details and merges duplicates. */
export default async function CustomerPage({ params, searchParams }: { params: Promise<{ shop: string; customer: string }>; searchParams: Promise<{ dup?: string | string[] }> }) {
  const { shop: slug, customer: id } = await params;
  const { actor, shop, customer } = await loadPage("customer", { shop: slug, customer: id }, "customer:view", `/shop/${slug}/customers/${id}`);
  const detail = await getCustomerDetail({
    shopId: shop.id,
    customerId: customer.id,
  });
  const here = { shopId: shop.id };
  const mayEdit = can(actor, "customer:edit", here);
  const mayMerge = can(actor, "customer:merge", here);
  const base = `/shop/${shop.slug}`;
  const day = new Intl.DateTimeFormat("en-US", {
    timeZone: shop.timezone,
    month: "short",
    day: "numeric",
    year: "numeric",
  });
  const machineName = new Map(detail.machines.map((m) => [m.id, describeMachine(m)]));

  // Possible duplicates: a search the desk types, or by default others with this name.
  const rawDup = (await searchParams).dup;
  const dup = (Array.isArray(rawDup) ? rawDup[0] : rawDup)?.trim().slice(0, 100) ?? customer.name;
  const candidates: MergeCandidate[] = mayMerge
    ? (
        await listCustomers({
          shopId: shop.id,
          query: { q: dup, page: 1 },
          pageSize: 10,
        })
      ).rows
        .filter((r) => r.id !== customer.id)
        .map((r) => ({
          id: r.id,
          name: r.name,
          contact: [r.phone, r.email].filter(Boolean).join(" · ") || "no contact on file",
          machines: r.machines.map((m) => describeMachine(m)).join("; ") || "no machine",
          jobCount: r.jobCount,
        }))
    : [];

  return (
    <div className="space-y-6">
      <PageHeader title={customer.name} description={`Customer since ${day.format(customer.createdAt)}`} back={{ href: `${base}/customers`, label: "All customers" }} />

      <Card as="section" title="How to reach them" headingId="contact">
        <dl className="mb-4 grid gap-x-6 gap-y-2 sm:grid-cols-[auto_1fr]">
          <dt className="font-semibold text-ink">Prefers</dt>
          <dd>{customer.contactPreference ? CONTACT_PREFERENCE_LABEL[customer.contactPreference] : "Not asked yet"}</dd>
          <dt className="font-semibold text-ink">Phone</dt>
          <dd>
            {customer.phone ? (
              <a className={link} href={`tel:${customer.phone.replace(/[^\d+]/g, "")}`}>
                {customer.phone}
              </a>
            ) : (
              "—"
            )}
          </dd>
          <dt className="font-semibold text-ink">E-mail</dt>
          <dd className="break-all">
            {customer.email ? (
              <a className={link} href={`mailto:${customer.email}`}>
                {customer.email}
              </a>
            ) : (
              "—"
            )}
          </dd>
          <dt className="font-semibold text-ink">Signs in</dt>
          <dd>{customer.userId ? "Yes: sees their jobs online" : "Not yet"}</dd>
        </dl>
        {mayEdit ? (
          <details>
            <summary className="inline-flex min-h-tap cursor-pointer items-center font-semibold text-oil">Change contact details</summary>
            <div className="mt-3">
              <ContactForm
                shopSlug={shop.slug}
                customerId={customer.id}
                contact={{ name: customer.name, email: customer.email, phone: customer.phone, contactPreference: customer.contactPreference }}
              />
            </div>
          </details>
        ) : null}
      </Card>

      <Card as="section" title="Machines" headingId="machines">
        {detail.machines.length === 0 ? (
          <p className="text-ink-muted">No machine on file.</p>
        ) : (
          <ul className="space-y-2">
            {detail.machines.map((m) => (
              <li key={m.id}>
                <Link href={`${base}/machines/${m.id}`} className={link}>
                  {describeMachine(m)}
                </Link>{" "}
                <span className="text-ink-muted">
                  · {MACHINE_KIND_LABEL[m.kind]}
                  {m.serial ? ` · serial ${m.serial}` : ""} · {m.jobCount} {m.jobCount === 1 ? "job" : "jobs"}
                </span>
              </li>
            ))}
          </ul>
        )}
      </Card>

      <Card as="section" title="Jobs" headingId="jobs">
        {detail.jobs.length === 0 ? (
          <p className="text-ink-muted">No jobs yet.</p>
        ) : (
          <JobsTable
            label={`Jobs for ${customer.name}`}
            shopSlug={shop.slug}
            timeZone={shop.timezone}
            showMachine
            jobs={detail.jobs.map((j) => ({ ...j, machine: machineName.get(j.machineId) }))}
          />
        )}
      </Card>

      {mayMerge ? (
        <Card
          as="section"
          title="Merge a duplicate record"
          headingId="merge"
          description="Two records for one person split their history. Merging moves the duplicate's jobs and machines here; this record keeps its details and takes only what it lacks."
        >
          <form method="get" className="mb-4 flex flex-col gap-3 sm:flex-row sm:items-end">
            <Field id="merge-search" label="Find the duplicate" hint="Name, e-mail, phone or machine" className="flex-1">
              <Input name="dup" type="search" defaultValue={dup} maxLength={100} autoComplete="off" />
            </Field>
            <Button type="submit" variant="secondary" icon={<Search aria-hidden className="size-5" />}>
              Find
            </Button>
          </form>
          {candidates.length ? (
            <MergeForm shopSlug={shop.slug} customerId={customer.id} keptName={customer.name} candidates={candidates} />
          ) : (
            <p className="text-ink-muted">No other record matches that search.</p>
          )}
          {detail.merges.length ? (
            <div className="mt-4">
              <h3 className="font-bold text-ink">Merged into this record</h3>
              <ul className="mt-1 space-y-1 text-sm text-ink-muted">
                {detail.merges.map((m) => (
                  <li key={m.id}>
                    {day.format(m.at)}: {m.removedName}
                    {m.removedEmail ? ` (${m.removedEmail})` : ""}, {m.jobs} {m.jobs === 1 ? "job" : "jobs"} and {m.machines} {m.machines === 1 ? "machine" : "machines"}, by{" "}
                    {m.by ?? "a former member of staff"}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
        </Card>
      ) : null}
    </div>
  );
}
