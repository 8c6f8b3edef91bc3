import "server-only";
import type { Knex } from "knex";

// The board's search box, each branch read through an index of its own (migrations 21 and 39)
// instead of `%q%` over four columns, all on jobs alone (the job carries its owner's name and its
// machine's make, model and serial):
// - a job number ("J-0042", "j42", "42") through the (shop_id, number) unique key, exactly;
// - the start of the owner's name and of the machine's serial, by prefix;
// - whole words of three letters or more (innodb_ft_min_token_size), each as a word prefix, in
//   the owner's name, make, model and serial together, through one FULLTEXT index;
// - a query with no such word (one or two letters, "KT") by prefix of make and model as well.
//
// A search with words first asks whether any small branch (number, prefixes) finds anything: an
// EXISTS per branch, each stopping at its first index row. Mostly none does (a make, a model, a
// surname in the middle of a name), and the page is then read straight off the FULLTEXT index,
// sort columns and all: a word that matches one job in eight is never merged through a
// de-duplicating temporary table nor joined back to jobs, only sorted for the page. Otherwise
// the small branches are merged (UNION) and the word branch appended (UNION ALL) without what
// they already found.

const JOB_NUMBER = /^(?:j-?)?0*(\d{1,9})$/i;
/** Shorter words are not in a FULLTEXT index (innodb_ft_min_token_size, 3 by default). */
export const MIN_WORD = 3;

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (ch) => `\\${ch}`);

/** How a search text is looked up: its job number, its prefix pattern, its FULLTEXT words and the short words beside them. */
export function searchPlan(q: string): { number: number | null; prefix: string; words: string | null; short: string[] } {
  const number = JOB_NUMBER.exec(q)?.[1];
  // Only letters and digits reach MATCH … AGAINST: the boolean-mode operators (+ - " * ( ) ~ < >)
  // in a search never act as operators.
  const tokens = q.split(/[^\p{L}\p{N}]+/u).filter(Boolean);
  const words = tokens.filter((w) => w.length >= MIN_WORD);
  return {
    number: number == null ? null : Number(number),
    prefix: `${escapeLike(q)}%`,
    words: words.length ? words.map((w) => `+${w}*`).join(" ") : null,
    // "Brin Fallowby 40": the index can't hold "40", so the rows its words find must contain it.
    short: words.length ? tokens.filter((w) => w.length < MIN_WORD).map((w) => `%${escapeLike(w)}%`) : [],
  };
}

/** The number and prefix branches (without words: make and model too), each made by `branch`. */
function smallBranches(plan: ReturnType<typeof searchPlan>, branch: () => Knex.QueryBuilder): Knex.QueryBuilder[] {
  const small = [branch().where("j.customer_name", "like", plan.prefix), branch().where("j.machine_serial", "like", plan.prefix)];
  if (plan.number != null) small.push(branch().where("j.number", plan.number));
  if (!plan.words) small.push(branch().where("j.machine_make", "like", plan.prefix), branch().where("j.machine_model", "like", plan.prefix));
  return small;
}

/** `SELECT … AS found`: 1 when any small branch finds one of the shop's jobs (each EXISTS stops at its first row). */
export function smallSearch(k: Knex, shopId: number, q: string): Knex.QueryBuilder {
  const parts = smallBranches(searchPlan(q), () => k("jobs as j").where("j.shop_id", shopId).select(k.raw("1"))).map((b) => b.toSQL());
  return k.select(k.raw(`${parts.map((p) => `EXISTS (${p.sql})`).join(" OR ")} AS found`, parts.flatMap((p) => [...p.bindings])));
}

/**
 * The shop's jobs that match `q` (`anySmall`: what smallSearch answered). `branch` makes each
 * branch: the shop's jobs (alias j) with the board's other filters applied and the columns the
 * board sorts on. One table read when only words can match, else a UNION.
 */
export function searchHits(q: string, anySmall: boolean, branch: () => Knex.QueryBuilder): { single: Knex.QueryBuilder } | { union: Knex.QueryBuilder } {
  const plan = searchPlan(q);
  const [first, ...rest] = smallBranches(plan, branch);
  if (!plan.words) return { union: first!.union(rest) }; // UNION, not UNION ALL: a job found twice counts once
  const words = branch().whereRaw("MATCH (j.customer_name, j.machine_make, j.machine_model, j.machine_serial) AGAINST (? IN BOOLEAN MODE)", [plan.words]);
  // "Brin Fallowby 40": the index can't hold "40", so the rows its words find must contain it.
  for (const like of plan.short) {
    words.where((w) => w.where("j.customer_name", "like", like).orWhere("j.machine_make", "like", like).orWhere("j.machine_model", "like", like).orWhere("j.machine_serial", "like", like));
  }
  if (!anySmall) return { single: words };
  // Found by a small branch already: not again (the columns are never NULL, so NOT LIKE is exact).
  words.whereRaw("NOT (j.customer_name LIKE ?)", [plan.prefix]).whereRaw("NOT (j.machine_serial LIKE ?)", [plan.prefix]);
  if (plan.number != null) words.whereNot("j.number", plan.number);
  // The DISTINCT unions first: MariaDB lets a UNION ALL to their right append without de-duplicating.
  return { union: first!.union(rest).unionAll(words) };
}
