import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { boardQueries } from "@/db/queries/jobs";
import { seedBoardScale } from "@/db/seeds/board-scale";
import { jobListQuerySchema } from "@/lib/schemas/jobs";
import { testKnex } from "../support/db";

// The board's plans at a shop with thousands of jobs (issue 17): every sort, filter, search kind
// and the count reads an index range of the shop's jobs, never the table or the shop's whole
// history, and the sorts come in index order (no filesort), so a page reads about a page of rows.
// ANALYZE runs each query and reports the rows each step actually read (r_rows).

const JOBS = 3000;
const TODAY = "2026-12-01";
const STATUS_LED = ["jobs_board_status_updated", "jobs_shop_id_status_promised_on_index", "jobs_board_status_asc", "jobs_board_status_desc"];

type PlanRow = { id: number | null; select_type: string; table: string | null; type: string | null; key: string | null; rows: number | null; r_rows: number | null; Extra: string | null };

type Variant = {
  name: string;
  query: Record<string, string>;
  /** Keys that may read the jobs of the page's ids step (one of them must). */
  keys: string[];
  /** A sort: the order comes from the index, no filesort of the shop's jobs. */
  ordered?: boolean;
  /** Keys that must appear somewhere in the plan (the search branches). */
  uses?: string[];
  /** Keys that must appear in the plan of a search's small branches (number, prefixes). */
  small?: string[];
};

const SORTS: Variant[] = (["updated", "number", "status", "promised", "customer"] as const).flatMap((sort) =>
  (["desc", "asc"] as const).map((dir) => ({
    name: `sort ${sort} ${dir}`,
    query: { sort, dir },
    keys: [sort === "number" ? "jobs_shop_id_number_unique" : `jobs_board_${sort}_${dir}`],
    ordered: true,
  })),
);

const FILTERS: Variant[] = [
  { name: "one status", query: { status: "in_progress" }, keys: STATUS_LED },
  { name: "the history's status, in its order", query: { status: "picked_up" }, keys: ["jobs_board_status_updated"], ordered: true },
  { name: "two statuses", query: { status: "waiting_parts,in_progress" }, keys: STATUS_LED },
  { name: "technician", query: { technician: "TECH" }, keys: ["jobs_board_technician_updated"], ordered: true },
  { name: "overdue", query: { attention: "overdue" }, keys: ["jobs_shop_id_status_promised_on_index"] },
  { name: "waiting on parts", query: { attention: "waiting_parts" }, keys: STATUS_LED },
  { name: "answered, not started", query: { attention: "answered" }, keys: STATUS_LED },
  { name: "ready, unpaid", query: { attention: "ready_unpaid" }, keys: STATUS_LED },
  { name: "owner slow", query: { attention: "owner_slow" }, keys: STATUS_LED },
  { name: "every quick filter", query: { attention: "overdue,waiting_parts,answered,ready_unpaid,owner_slow" }, keys: STATUS_LED },
  { name: "overdue, sorted by owner", query: { attention: "overdue", sort: "customer", dir: "asc" }, keys: ["jobs_shop_id_status_promised_on_index"] },
];

// A search with words first asks its number and prefix branches (`small`, each its own index of
// jobs) whether they find anything; the page then reads the words' FULLTEXT index straight (no join
// back to jobs), merged with those branches when they did. Without words: the branches alone.
const SEARCHED = ["jobs_search_fulltext", "jobs_board_customer_desc", "jobs_board_customer_asc"];
const SEARCHES: Variant[] = [
  { name: "job number", query: { q: "J-0042" }, keys: SEARCHED, uses: ["jobs_shop_id_number_unique", "jobs_search_fulltext"], small: ["jobs_shop_id_number_unique"] },
  { name: "serial prefix", query: { q: "SC00012" }, keys: SEARCHED, uses: ["jobs_search_fulltext"], small: ["jobs_search_serial"] },
  { name: "owner's name", query: { q: "Dunmore" }, keys: SEARCHED, uses: ["jobs_search_fulltext"], small: ["jobs_search_serial"] },
  // Nothing starts with the word: the page is the FULLTEXT read alone.
  { name: "make or model word", query: { q: "Ridgeback" }, keys: ["jobs_search_fulltext"], small: ["jobs_search_serial"] },
  { name: "two letters", query: { q: "Ko" }, keys: ["jobs_board_customer_desc", "jobs_board_customer_asc"], uses: ["jobs_search_serial", "jobs_search_make", "jobs_search_model"] },
  { name: "search with a filter", query: { q: "Dunmore", status: "picked_up", sort: "customer" }, keys: SEARCHED, uses: ["jobs_search_fulltext"] },
];

describe("job board plans at scale: no full scan of a shop's jobs", () => {
  let db: Knex;
  let shopId: number;
  let tech: number;

  beforeAll(async () => {
    db = testKnex();
    // Another shop's jobs in the same tables, as in production.
    await seedBoardScale(db, { jobs: 600, entriesPerJob: 1, label: "explain-other", seed: 3 });
    const seeded = await seedBoardScale(db, { jobs: JOBS, entriesPerJob: 2, label: "explain" });
    shopId = seeded.shopId;
    tech = seeded.technicianIds[0]!;
    for (const t of ["jobs", "customers", "machines", "job_status_changes", "invoices", "journal_entries", "shops"]) await db.raw(`ANALYZE TABLE ${t}`);
  }, 180_000);
  afterAll(async () => db?.destroy());

  const plan = async (q: Knex.QueryBuilder): Promise<PlanRow[]> => {
    const { sql, bindings } = q.toSQL();
    const [rows] = await db.raw(`ANALYZE ${sql}`, bindings as Knex.RawBinding[]);
    return rows as PlanRow[];
  };
  const describeRow = (r: PlanRow) => `${r.select_type} ${r.table} ${r.type} ${r.key} r_rows=${r.r_rows} ${r.Extra ?? ""}`;

  /** Checks every step of a plan: no table scan anywhere, no full index scan, jobs read by index. */
  function expectIndexed(rows: PlanRow[], label: string) {
    for (const r of rows) {
      const real = r.table != null && !r.table.startsWith("<");
      if (real) expect(["ALL", "index"], `${label}: ${describeRow(r)}`).not.toContain(r.type);
      if (real) expect(r.key, `${label}: ${describeRow(r)}`).not.toBeNull();
    }
  }

  const queries = (raw: Record<string, string>) => {
    const query = Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, v === "TECH" ? String(tech) : v]));
    return boardQueries({ shopId, query: jobListQuerySchema.parse(query), today: TODAY });
  };

  for (const v of [...SORTS, ...FILTERS, ...SEARCHES]) {
    it(`${v.name}: page and count read indexes only`, async () => {
      const { page, count, small } = await queries(v.query);
      if (small) {
        const smallRows = await plan(small);
        expectIndexed(smallRows, `${v.name} small branches`);
        for (const key of v.small ?? []) expect(smallRows.map((r) => r.key), `${v.name} small branches use ${key}`).toContain(key);
      }
      const pageRows = await plan(page);
      expectIndexed(pageRows, `${v.name} page`);
      // The step that picks the page's ids from the shop's jobs.
      const ids = pageRows.filter((r) => r.select_type === "DERIVED" && r.table === "j");
      expect(ids, pageRows.map(describeRow).join("\n")).toHaveLength(1);
      expect(v.keys, describeRow(ids[0]!)).toContain(ids[0]!.key);
      // (A job found by its number alone is one row read by key: a `const` step, with no r_rows.)
      if (ids[0]!.type !== "const") expect(ids[0]!.r_rows, "ANALYZE reports the rows read").not.toBeNull();
      if (v.ordered) {
        expect(ids[0]!.Extra ?? "", describeRow(ids[0]!)).not.toMatch(/filesort/);
        // In index order, a first page of 25 stops after about 25 rows, at any size of history.
        expect(Number(ids[0]!.r_rows), describeRow(ids[0]!)).toBeLessThanOrEqual(26);
      } else if (ids[0]!.key !== "jobs_search_fulltext") {
        expect(Number(ids[0]!.r_rows), describeRow(ids[0]!)).toBeLessThan(JOBS / 4);
      } else {
        // A word's rows come off its FULLTEXT entry: as many as the jobs with that word, never a scan.
        expect(ids[0]!.type, describeRow(ids[0]!)).toBe("fulltext");
      }
      for (const key of v.uses ?? []) expect(pageRows.map((r) => r.key), `${v.name} uses ${key}`).toContain(key);

      const countRows = await plan(count);
      expectIndexed(countRows, `${v.name} count`);
      // The count joins nothing but the search's hits.
      const tables = countRows.filter((r) => r.select_type !== "UNION" && r.select_type !== "DERIVED").map((r) => r.table);
      expect(tables.filter((t) => t === "c" || t === "m" || t === "t")).toEqual([]);
    });
  }

  it("pages deep into the history by the index too (no filesort)", async () => {
    const { page } = await queries({ page: "40", pageSize: "50", sort: "customer", dir: "asc" });
    const ids = (await plan(page)).find((r) => r.select_type === "DERIVED" && r.table === "j")!;
    expect(ids.key).toBe("jobs_board_customer_asc");
    expect(ids.Extra ?? "").toMatch(/Using index/);
    expect(ids.Extra ?? "").not.toMatch(/filesort/);
    expect(Number(ids.r_rows)).toBeLessThanOrEqual(40 * 50 + 1);
  });
});
