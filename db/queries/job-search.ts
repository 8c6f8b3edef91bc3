import "server-only";
import type { Knex } from "knex";

// The board's search box, as a set of job ids, each branch read through an index of its own
// (migration 21) instead of `%q%` over four columns:
// - a job number ("J-0042", "j42", "42") through the (shop_id, number) unique key, exactly;
// - the start of the owner's name (jobs.customer_name) and of the machine's serial, by prefix;
// - whole words of three letters or more (innodb_ft_min_token_size), each as a word prefix, in
//   the owner's name or in the machine's make, model and serial, through FULLTEXT indexes;
// - a query with no such word (one or two letters, "KT") by prefix of make and model as well.

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

/** `SELECT id` of the shop's jobs that match `q`: a UNION whose every branch reads an index range. */
export function searchHits(k: Knex, shopId: number, q: string): Knex.QueryBuilder {
  const plan = searchPlan(q);
  const jobsOf = (table: "customers as c" | "machines as m", key: "customer_id" | "machine_id") => {
    const alias = table.slice(-1);
    return k(table)
      .join("jobs as j", (on) => on.on("j.shop_id", `${alias}.shop_id`).andOn(`j.${key}`, `${alias}.id`))
      .where(`${alias}.shop_id`, shopId)
      .select("j.id");
  };
  const branches: Knex.QueryBuilder[] = [
    k("jobs").where("shop_id", shopId).where("customer_name", "like", plan.prefix).select("id"),
    jobsOf("machines as m", "machine_id").where("m.serial", "like", plan.prefix),
  ];
  if (plan.number != null) branches.push(k("jobs").where({ shop_id: shopId, number: plan.number }).select("id"));
  if (plan.words) {
    const owners = jobsOf("customers as c", "customer_id").whereRaw("MATCH (c.name) AGAINST (? IN BOOLEAN MODE)", [plan.words]);
    const machines = jobsOf("machines as m", "machine_id").whereRaw("MATCH (m.make, m.model, m.serial) AGAINST (? IN BOOLEAN MODE)", [plan.words]);
    for (const like of plan.short) {
      owners.where("c.name", "like", like);
      machines.where((w) => w.where("m.make", "like", like).orWhere("m.model", "like", like).orWhere("m.serial", "like", like));
    }
    branches.push(owners, machines);
  } else {
    branches.push(jobsOf("machines as m", "machine_id").where("m.make", "like", plan.prefix));
    branches.push(jobsOf("machines as m", "machine_id").where("m.model", "like", plan.prefix));
  }
  const [first, ...rest] = branches;
  return first!.union(rest); // UNION, not UNION ALL: a job found twice counts once
}
