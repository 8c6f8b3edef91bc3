import type { Metadata } from "next";
import Link from "next/link";
import { Search, Users } from "lucide-react";
import { Alert, Button, Card, EmptyState, Field, Input, LinkPagination, PageHeader, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { listCustomers } from "@/db/queries/customers";
import { CONTACT_PREFERENCE_LABEL } from "@/lib/customers";
import { describeMachine } from "@/lib/machine";
import { customerListQuerySchema } from "@/lib/schemas/customers";
import { shopPageAccess } from "../shop-access";

export const metadata: Metadata = { title: "Customers" };

type Search = Record<string, string | string[] | undefined>;
const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

/** The shop's customers: search by person or machine, paged on the server. Cards on a phone, a table from `md` up. */
export default async function CustomersPage({ params, searchParams }: { params: Promise<{ shop: string }>; searchParams: Promise<Search> }) {
  const { shop: slug } = await params;
  const { shop } = await shopPageAccess(slug, "customer:view", `/shop/${slug}/customers`);
  const raw = await searchParams;
  const parsed = customerListQuerySchema.safeParse({
    q: first(raw.q),
    page: first(raw.page),
  });
  const query = parsed.success ? parsed.data : { q: "", page: 1 };
  const list = await listCustomers({ shopId: shop.id, query });
  const base = `/shop/${shop.slug}/customers`;
  const pageHref = (page: number) => `${base}?${new URLSearchParams({ ...(query.q ? { q: query.q } : {}), page: String(page) })}`;
  const day = new Intl.DateTimeFormat("en-US", {
    timeZone: shop.timezone,
    month: "short",
    day: "numeric",
    year: "numeric",
  });
  const machinesText = (r: (typeof list.rows)[number]) => r.machines.map((m) => describeMachine(m) + (m.serial ? ` (${m.serial})` : "")).join("; ") || "No machine on file";

  return (
    <div className="space-y-4">
      <PageHeader title="Customers" description="Everyone who has brought a machine in, with their machines and jobs." />
      <form role="search" method="get" action={base} className="flex flex-col gap-3 sm:flex-row sm:items-end">
        <Field id="customer-search" label="Search customers" hint="Name, e-mail, phone, or a machine's make, model or serial" className="flex-1">
          <Input name="q" type="search" defaultValue={query.q} maxLength={100} autoComplete="off" />
        </Field>
        <Button type="submit" variant="secondary" icon={<Search aria-hidden className="size-5" />}>
          Search
        </Button>
      </form>
      {parsed.success ? null : <Alert tone="warning">{parsed.error.issues[0]?.message ?? "That search couldn't be read."} Showing everyone instead.</Alert>}

      {list.rows.length === 0 ? (
        <EmptyState
          icon={Users}
          title={query.q ? "No customer matches" : "No customers yet"}
          description={query.q ? "Try part of the name, the phone number's last digits, or the machine's serial." : "Customers are added when a machine is checked in."}
        />
      ) : (
        <>
          {/* Phones: one card per customer. */}
          <ul className="space-y-3 md:hidden" aria-label="Customers">
            {list.rows.map((r) => (
              <li key={r.id} data-testid="customer-card">
                <Card as="article" className="p-4">
                  <Link href={`${base}/${r.id}`} className="inline-flex min-h-tap items-center text-lg font-bold text-oil underline underline-offset-2 hover:no-underline">
                    {r.name}
                  </Link>
                  <p className="break-words text-ink">{[r.phone, r.email].filter(Boolean).join(" · ") || "No contact on file"}</p>
                  <p className="text-sm text-ink-muted">{machinesText(r)}</p>
                  <p className="text-sm text-ink-muted">
                    {r.jobCount} {r.jobCount === 1 ? "job" : "jobs"}
                    {r.openJobCount ? `, ${r.openJobCount} in the shop` : ""}
                    {r.lastJobAt ? ` · last ${day.format(r.lastJobAt)}` : ""}
                  </p>
                </Card>
              </li>
            ))}
          </ul>
          {/* Wider screens: a table. */}
          <Table label="Customers" wrapperClassName="hidden md:block">
            <THead>
              <TR>
                <TH>Name</TH>
                <TH>Contact</TH>
                <TH>Prefers</TH>
                <TH>Machines</TH>
                <TH>Jobs</TH>
                <TH>Last job</TH>
              </TR>
            </THead>
            <TBody>
              {list.rows.map((r) => (
                <TR key={r.id}>
                  <TD>
                    <Link href={`${base}/${r.id}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
                      {r.name}
                    </Link>
                  </TD>
                  <TD className="break-all">{[r.phone, r.email].filter(Boolean).join(" · ") || "—"}</TD>
                  <TD>{r.contactPreference ? CONTACT_PREFERENCE_LABEL[r.contactPreference] : "—"}</TD>
                  <TD>{machinesText(r)}</TD>
                  <TD className="whitespace-nowrap">
                    {r.jobCount}
                    {r.openJobCount ? ` (${r.openJobCount} in the shop)` : ""}
                  </TD>
                  <TD className="whitespace-nowrap">{r.lastJobAt ? day.format(r.lastJobAt) : "—"}</TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </>
      )}

      <LinkPagination
        page={list.page}
        hasNext={list.page < list.pageCount}
        href={pageHref}
        label={`Page ${Math.min(list.page, list.pageCount)} of ${list.pageCount} · ${list.total.toLocaleString("en")} ${list.total === 1 ? "customer" : "customers"}`}
      />
    </div>
  );
}
