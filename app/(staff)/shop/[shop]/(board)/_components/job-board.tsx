"use client";
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import { type ColumnDef, type SortingState, flexRender, getCoreRowModel, useReactTable } from "@tanstack/react-table";
import { ClipboardList, Hourglass, MessageSquareReply, Package, ReceiptText, TriangleExclamationPoint, type LucideIcon } from "lucide-react";
import clsx from "clsx";
import { StatusBadge } from "@/components/status-badge";
import { Alert, EmptyState, Field, Input, Pagination, Select, Table, TBody, TD, TH, THead, TR } from "@/components/ui";
import { JOB_STATUSES, JOB_STATUS_LABEL, type JobStatus } from "@/lib/job-status";
import { type JobBoardPage, type JobBoardRow, jobAttention } from "@/lib/jobs-view";
import { JOB_ATTENTION, type JobAttention, type JobListQuery, formatJobNumber } from "@/lib/schemas/jobs";
import { jobQueryToSearch, useJobBoard } from "@/lib/swr/use-job-board";
import { JobCard, OverdueBadge, WaitsOn, attentionClasses } from "./job-card";

type Props = {
  shopSlug: string;
  today: string;
  technicians: { id: number; name: string }[];
  initialQuery: JobListQuery;
  initialData: JobBoardPage;
};

// Column id → the server's sort key. Columns not listed here don't sort.
const SORT_KEY: Partial<Record<string, JobListQuery["sort"]>> = {
  number: "number",
  status: "status",
  customerName: "customer",
  promisedOn: "promised",
  updatedAt: "updated",
};

// The quick filters' own words (not the status names, which the status chips already use).
const ATTENTION_LOOK: Record<JobAttention, { label: string; icon: LucideIcon }> = {
  overdue: { label: "Overdue", icon: TriangleExclamationPoint },
  waiting_parts: { label: "Held for parts", icon: Package },
  answered: { label: "Answered, not started", icon: MessageSquareReply },
  ready_unpaid: { label: "Ready, unpaid", icon: ReceiptText },
  owner_slow: { label: "Owner slow to answer", icon: Hourglass },
};

export function JobBoard({ shopSlug, today, technicians, initialQuery, initialData }: Props) {
  const [query, setQuery] = useState(initialQuery);
  const [searchText, setSearchText] = useState(initialQuery.q);
  const { data, error, isLoading, isValidating } = useJobBoard(shopSlug, query, { search: jobQueryToSearch(initialQuery), data: initialData });

  // Type-ahead search, sent once typing pauses.
  useEffect(() => {
    const t = setTimeout(() => setQuery((q) => (q.q === searchText.trim() ? q : { ...q, q: searchText.trim(), page: 1 })), 300);
    return () => clearTimeout(t);
  }, [searchText]);

  // Keep the address bar in step (shareable, survives reload) without a server round trip.
  useEffect(() => {
    const search = jobQueryToSearch(query);
    window.history.replaceState(null, "", search ? `?${search}` : window.location.pathname);
  }, [query]);

  const columns = useMemo<ColumnDef<JobBoardRow>[]>(
    () => [
      {
        id: "number",
        header: "Job",
        cell: ({ row }) => (
          <Link href={`/shop/${shopSlug}/jobs/${row.original.number}`} className="whitespace-nowrap font-semibold text-oil underline-offset-2 hover:underline">
            {formatJobNumber(row.original.number)}
          </Link>
        ),
      },
      { id: "status", header: "Status", cell: ({ row }) => <StatusBadge status={row.original.status} /> },
      {
        id: "machine",
        header: "Machine",
        cell: ({ row }) => (
          <div>
            <div className="font-medium">{row.original.machine}</div>
            {row.original.serial ? <div className="text-sm text-ink-muted">{row.original.serial}</div> : null}
          </div>
        ),
      },
      { id: "waitingOn", header: "Waits on", cell: ({ row }) => <WaitsOn row={row.original} /> },
      { id: "customerName", header: "Owner", cell: ({ row }) => row.original.customerName },
      { id: "concern", header: "Concern", cell: ({ row }) => <span className="line-clamp-2 max-w-xs">{row.original.concern}</span> },
      {
        id: "promisedOn",
        header: "Promised",
        cell: ({ row }) =>
          row.original.promisedOn ? (
            <div className="flex flex-col items-start gap-1">
              <span className="whitespace-nowrap">{row.original.promisedOn}</span>
              <OverdueBadge row={row.original} today={today} />
            </div>
          ) : (
            <span className="text-ink-muted">—</span>
          ),
      },
      { id: "technician", header: "Technician", cell: ({ row }) => row.original.technician ?? <span className="text-ink-muted">Unassigned</span> },
      {
        id: "updatedAt",
        header: "Updated",
        cell: ({ row }) => (
          <time dateTime={row.original.updatedAt} className="whitespace-nowrap">
            {row.original.updatedAt.slice(0, 10)}
          </time>
        ),
      },
    ],
    [shopSlug, today],
  );

  const sortColumn = Object.entries(SORT_KEY).find(([, key]) => key === query.sort)?.[0] ?? "updatedAt";
  const sorting: SortingState = [{ id: sortColumn, desc: query.dir === "desc" }];
  const page = data ?? initialData;
  // The React Compiler is not enabled here, so its memoisation warning does not apply.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: page.rows,
    columns,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    pageCount: page.pageCount,
    getCoreRowModel: getCoreRowModel(),
  });

  const toggleAttention = (flag: JobAttention) =>
    setQuery((q) => ({ ...q, page: 1, attention: q.attention.includes(flag) ? q.attention.filter((f) => f !== flag) : [...q.attention, flag] }));
  const filtered = Boolean(query.q || query.status.length || query.attention.length || query.technician);
  const toggleStatus = (status: JobStatus) =>
    setQuery((q) => ({ ...q, page: 1, status: q.status.includes(status) ? q.status.filter((s) => s !== status) : [...q.status, status] }));
  const sortBy = (columnId: string) => {
    const key = SORT_KEY[columnId];
    if (!key) return;
    setQuery((q) => ({ ...q, page: 1, sort: key, dir: q.sort === key && q.dir === "asc" ? "desc" : "asc" }));
  };

  return (
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-[2fr_1fr]">
        <Field id="job-search" label="Search" hint="Job number, owner, make, model or serial">
          <Input type="search" value={searchText} onChange={(e) => setSearchText(e.target.value)} placeholder="e.g. J-0042 or Calloway" />
        </Field>
        <Field id="job-technician" label="Technician">
          <Select
            value={query.technician ?? ""}
            onChange={(e) => setQuery((q) => ({ ...q, page: 1, technician: e.target.value ? Number(e.target.value) : undefined }))}
          >
            <option value="">Anyone</option>
            {technicians.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <fieldset>
        <legend className="mb-2 font-semibold">Needs attention</legend>
        <div className="flex flex-wrap gap-2">
          {JOB_ATTENTION.map((flag) => {
            const look = ATTENTION_LOOK[flag];
            const on = query.attention.includes(flag);
            return (
              <button
                key={flag}
                type="button"
                aria-pressed={on}
                onClick={() => toggleAttention(flag)}
                className={clsx(
                  "inline-flex min-h-tap items-center gap-1.5 rounded-full border px-3 text-sm font-medium",
                  on ? "border-oil bg-oil text-oil-on" : "border-line-strong bg-surface text-ink hover:bg-sunken",
                )}
              >
                <look.icon aria-hidden className="size-4 shrink-0" />
                {look.label}
              </button>
            );
          })}
        </div>
      </fieldset>
      <fieldset>
        <legend className="mb-2 font-semibold">Status</legend>
        <div className="flex flex-wrap gap-2">
          {JOB_STATUSES.map((s) => (
            <button
              key={s}
              type="button"
              aria-pressed={query.status.includes(s)}
              onClick={() => toggleStatus(s)}
              className={clsx(
                "min-h-tap rounded-full border px-3 text-sm font-medium",
                query.status.includes(s) ? "border-oil bg-oil text-oil-on" : "border-line-strong bg-surface text-ink hover:bg-sunken",
              )}
            >
              {JOB_STATUS_LABEL[s]}
            </button>
          ))}
        </div>
      </fieldset>

      {error ? <Alert tone="error">{error.message}</Alert> : null}

      {page.total === 0 && !isLoading ? (
        <EmptyState
          icon={ClipboardList}
          title={filtered ? "No jobs match" : "No jobs yet"}
          description={filtered ? "Clear the search or filters to see more jobs." : "Jobs appear here once a machine is checked in: use “Check in a machine” above."}
        />
      ) : (
        <div aria-busy={isValidating}>
          {/* Said in words, not by fading the table: faded text would fail contrast. */}
          <p role="status" className="mb-2 min-h-5 text-sm text-ink-muted">
            {isValidating ? "Updating…" : ""}
          </p>
          {/* On a phone, one card per job reads better than a table scrolled sideways. */}
          <ul className="space-y-3 sm:hidden" aria-label="Jobs in this shop">
            {page.rows.map((row) => (
              <li key={row.number} data-testid="job-card">
                <JobCard row={row} shopSlug={shopSlug} today={today} />
              </li>
            ))}
          </ul>
          <Table label="Jobs in this shop" wrapperClassName="hidden sm:block">
            <THead>
              {table.getHeaderGroups().map((group) => (
                <TR key={group.id}>
                  {group.headers.map((header) => (
                    <TH
                      key={header.id}
                      sortDirection={SORT_KEY[header.id] ? (sortColumn === header.id ? query.dir : false) : undefined}
                      onSort={SORT_KEY[header.id] ? () => sortBy(header.id) : undefined}
                    >
                      {flexRender(header.column.columnDef.header, header.getContext())}
                    </TH>
                  ))}
                </TR>
              ))}
            </THead>
            <TBody>
              {table.getRowModel().rows.map((row) => (
                <TR key={row.id} data-testid="job-row" className={attentionClasses(jobAttention(row.original, today)).tint}>
                  {row.getVisibleCells().map((cell, i) => (
                    <TD key={cell.id} className={clsx(i === 0 && attentionClasses(jobAttention(row.original, today)).edge)}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </TD>
                  ))}
                </TR>
              ))}
            </TBody>
          </Table>
          <Pagination page={page.page} pageCount={page.pageCount} total={page.total} onPageChange={(p) => setQuery((q) => ({ ...q, page: p }))} />
        </div>
      )}
    </div>
  );
}
