// The bench's data, on top of the demo seed (its people sign in to the pages): a shop of 50,000 jobs and
// 1,000,000 journal entries, one of 1,000 jobs (the board's baseline, the same mix at 1/50 the size), and
// a 200-entry job of the demo owner Ruth Calloway at Copper Gulch for the job pages (notes,
// photo sets and clips). Written with
// INSERT … SELECT from MariaDB's SEQUENCE engine (seq_1_to_N): a million rows in a few statements.
// Names are invented (.test addresses). Idempotent: a shop that is there in full is left as it is.
import type { Knex } from "knex";
import { seedStory } from "./story";

export const SCALE_SHOPS = { big: { slug: "bench-scale-50k", jobs: 50_000 }, small: { slug: "bench-scale-1k", jobs: 1_000 } } as const;
export const ENTRIES_PER_JOB = 20;
/** One job of the big shop with this many entries: the timeline query count must not grow with it. */
export const LONG_JOB_ENTRIES = 5_000;
export const PAGE_JOB_ENTRIES = 200;
const PAGE_JOB_CONCERN = "Bench: a long job journal (200 entries)";
/** Terms found in both shops: one owner's name, a make (an eighth of the jobs), one whole serial, a job number. */
export const SEARCH = { owner: "Ilsa Marrow", make: "Corvane", serial: "KX7000000420", number: "J-0420" };

const FIRST = ["Ilsa", "Tobin", "Maren", "Okoro", "Wendell", "Priya", "Lucan", "Sabine", "Ezra", "Noemi", "Calder", "Yusra", "Bram", "Delphine", "Juno", "Hollis", "Anouk", "Teodor", "Rhea", "Silas"];
const LAST = ["Marrow", "Quill", "Ashgrove", "Pellham", "Darrow", "Vintner", "Oakes", "Brennick", "Tamsin", "Lowrey", "Castellan", "Fenwick", "Harrow", "Ilves", "Kestrel", "Morrow", "Nettle", "Orrin", "Penhale", "Rook"];
const MAKES = ["Corvane", "Halvorsen", "Tessaro", "Brightline", "Ostrava", "Kinloch", "Mereton", "Vashti"];
const MODELS = ["Ridge 450", "Trail 250", "Summit 800", "Marsh 570", "Dune 1000", "Cinder 125", "Pike 700", "Harbor 300"];
/**
 * A shop's open work doesn't grow with its history: a shop with 50,000 jobs behind it has about as
 * many machines in the building as one with 1,000. The newest OPEN_WINDOW jobs of each shop cycle
 * through the statuses below; everything older was collected long ago. (An even spread over the
 * whole history would put 30,000 machines on a 50k shop's bench and make every status filter
 * 50 times the work for a reason no shop has.)
 */
const OPEN_WINDOW = 400;
const STATUSES = ["picked_up", "picked_up", "picked_up", "picked_up", "ready", "in_progress", "waiting_parts", "waiting_approval", "inspecting", "checked_in"];
const KINDS = ["atv", "side_by_side", "dirt_bike", "street_bike", "snowmobile", "watercraft", "small_engine"];
const TECHS = 6;

const elt = (list: readonly string[], expr: string) => `ELT(1 + (${expr}) % ${list.length}, ${list.map((s) => `'${s}'`).join(", ")})`;
const note = (expr: string) =>
  `JSON_OBJECT('type', 'doc', 'content', JSON_ARRAY(JSON_OBJECT('type', 'paragraph', 'content', JSON_ARRAY(JSON_OBJECT('type', 'text', 'text', CONCAT('Checked the ', ${elt(["carburettor float height", "chain slack and sprocket wear", "brake pad thickness", "valve clearances", "coolant hoses", "spark plug gap", "fuel filter", "CV boots"], expr)}, '; readings written down and the part noted for the owner (entry ', ${expr}, ').'))))))`;

async function one(k: Knex, sql: string, bindings: readonly unknown[] = []): Promise<Record<string, unknown> | undefined> {
  const [rows] = (await k.raw(sql, bindings as Knex.RawBinding[])) as [Record<string, unknown>[]];
  return rows[0];
}

async function shopState(k: Knex, slug: string, jobs: number) {
  const shop = await one(k, "SELECT id FROM shops WHERE slug = ?", [slug]);
  if (!shop) return { id: null, complete: false };
  const id = Number(shop.id);
  const counts = await one(k, "SELECT (SELECT COUNT(*) FROM jobs WHERE shop_id = ?) AS jobs, (SELECT COUNT(*) FROM journal_entries WHERE shop_id = ?) AS entries", [id, id]);
  const complete = Number(counts?.jobs) === jobs && Number(counts?.entries) >= jobs * ENTRIES_PER_JOB;
  return { id, complete };
}

/** A shop of `jobs` jobs, jobs/2 customers, one machine per job, ENTRIES_PER_JOB entries per job. */
async function seedScaleShop(k: Knex, slug: string, jobs: number, log: (s: string) => void): Promise<number> {
  const state = await shopState(k, slug, jobs);
  if (state.complete && state.id !== null) return state.id;
  if (state.id !== null) await k.raw("DELETE FROM shops WHERE id = ?", [state.id]); // half-seeded: start again (cascades)
  const began = Date.now();
  const shopId = Number((await k("shops").insert({ slug, name: `Scale test ${jobs.toLocaleString("en")} jobs`, timezone: "UTC", next_job_number: jobs + 1 }))[0]);
  const customers = Math.max(1, jobs / 2);
  // Technicians of this shop, and Copper Gulch's owner as its owner (the timeline is read as her).
  for (let t = 1; t <= TECHS; t += 1) {
    const userId = Number((await k("users").insert({ email: `tech${t}@${slug}.test`, name: `${FIRST[t]} ${LAST[t + 3]}` }))[0]);
    await k("memberships").insert({ shop_id: shopId, user_id: userId, role: "technician" });
  }
  const dana = await one(k, "SELECT id FROM users WHERE email = 'dana@coppergulch.test'");
  if (dana) await k("memberships").insert({ shop_id: shopId, user_id: Number(dana.id), role: "owner" });
  const techs = (await k("memberships").where({ shop_id: shopId, role: "technician" }).select("user_id")).map((r: { user_id: number }) => Number(r.user_id));

  await k.raw(
    `INSERT INTO customers (shop_id, name, email, created_at)
     SELECT ?, CONCAT(${elt(FIRST, "seq")}, ' ', ${elt(LAST, "seq DIV 20")}), CONCAT('c', seq, '@', ?, '.test'), NOW() - INTERVAL 1100 DAY
     FROM seq_1_to_${customers}`,
    [shopId, slug],
  );
  const firstCustomer = Number((await one(k, "SELECT MIN(id) AS id FROM customers WHERE shop_id = ?", [shopId]))?.id);
  // Customer ids of one INSERT … SELECT are consecutive (InnoDB takes the AUTO_INCREMENT lock for it).
  await k.raw(
    `INSERT INTO machines (shop_id, customer_id, kind, year, make, model, serial, created_at)
     SELECT ?, ? + (seq - 1) % ?, ${elt(KINDS, "seq")}, 2004 + seq % 21, ${elt(MAKES, "seq DIV 3")}, ${elt(MODELS, "seq DIV 7")},
            CONCAT(${elt(["KX7", "RT2", "MB9", "ZL4", "HP1"], "seq")}, LPAD(seq, 9, '0')), NOW() - INTERVAL 1100 DAY
     FROM seq_1_to_${jobs}`,
    [shopId, firstCustomer, customers],
  );
  const firstMachine = Number((await one(k, "SELECT MIN(id) AS id FROM machines WHERE shop_id = ?", [shopId]))?.id);
  // One job per machine; about 30 minutes apart over the shop's history, the newest today.
  await k.raw(
    `INSERT INTO jobs (shop_id, number, public_id, customer_id, machine_id, status, concern, promised_on, technician_user_id, created_at, updated_at)
     SELECT ?, m.id - ? + 1, LEFT(SHA2(CONCAT(?, '-', m.id), 256), 16), m.customer_id, m.id, IF(m.id - ? + 1 > ? - ${OPEN_WINDOW}, ${elt(STATUSES, "m.id")}, 'picked_up'),
            CONCAT('Owner reports ', ${elt(["hard starting when cold", "a knock under load", "brakes fading", "oil weeping at the base gasket", "no spark", "poor idle"], "m.id")}),
            IF(m.id % 4 = 0, NULL, DATE(NOW() - INTERVAL ((? - (m.id - ? + 1)) * 30) MINUTE + INTERVAL (m.id % 15) DAY)),
            IF(m.id % 5 = 0, NULL, ELT(1 + m.id % ${techs.length}, ${techs.join(", ")})),
            NOW() - INTERVAL ((? - (m.id - ? + 1)) * 30 + 600) MINUTE,
            NOW() - INTERVAL ((? - (m.id - ? + 1)) * 30) MINUTE
     FROM machines m WHERE m.shop_id = ?`,
    [shopId, firstMachine, slug, firstMachine, jobs, jobs, firstMachine, jobs, firstMachine, jobs, firstMachine, shopId],
  );
  // A third of the jobs on the bench came back there with the owner's answer ("answered, not started").
  await k.raw(
    `INSERT INTO job_status_changes (shop_id, job_id, from_status, to_status, changed_by_user_id, changed_at, cause)
     SELECT shop_id, id, NULL, status, technician_user_id, updated_at, IF(status = 'in_progress' AND id % 3 = 0, 'request_answered', 'manual')
     FROM jobs WHERE shop_id = ?`,
    [shopId],
  );
  // Entries in slices of 5,000 jobs (100,000 rows a statement), so no one statement holds a huge undo log.
  const firstJob = Number((await one(k, "SELECT MIN(id) AS id FROM jobs WHERE shop_id = ?", [shopId]))?.id);
  for (let from = 0; from < jobs; from += 5_000) {
    await k.raw(
      `INSERT INTO journal_entries (shop_id, job_id, kind, visibility, author_user_id, body, created_at, shared_at)
       SELECT j.shop_id, j.id, 'note', IF(e.seq % 3 = 0, 'shared', 'shop'), j.technician_user_id, ${note("e.seq")},
              j.created_at + INTERVAL e.seq * 7 MINUTE, IF(e.seq % 3 = 0, j.created_at + INTERVAL e.seq * 7 MINUTE, NULL)
       FROM jobs j JOIN seq_1_to_${ENTRIES_PER_JOB} e
       WHERE j.shop_id = ? AND j.id BETWEEN ? AND ? ORDER BY j.id, e.seq`,
      [shopId, firstJob + from, firstJob + Math.min(from + 5_000, jobs) - 1],
    );
    log(`  ${slug}: entries for ${Math.min(from + 5_000, jobs).toLocaleString("en")} of ${jobs.toLocaleString("en")} jobs`);
  }
  log(`  ${slug}: ${jobs.toLocaleString("en")} jobs seeded in ${((Date.now() - began) / 1000).toFixed(0)} s`);
  return shopId;
}

/**
 * Every 5th entry of a job becomes a set of two photos and every 20th (offset 3) a ready clip with a
 * marked moment, so a timeline page reads what a real one does (photos, clips and moments are read in
 * queries of their own, skipped when a page has none). The photo files are not written: the pages and
 * the timeline API only link to them.
 */
async function mixMedia(k: Knex, jobId: number): Promise<void> {
  const done = await one(k, "SELECT COUNT(*) AS n FROM journal_entries WHERE job_id = ? AND kind <> 'note'", [jobId]);
  if (Number(done?.n) > 0) return;
  await k.raw("UPDATE journal_entries SET kind = 'photos', body = NULL, caption = 'Before and after' WHERE job_id = ? AND id % 5 = 0", [jobId]);
  await k.raw(
    `INSERT INTO photos (public_id, shop_id, job_id, entry_id, position, uploaded_by_user_id, original_name, display_key, thumb_key, width, height, bytes, created_at)
     SELECT LEFT(SHA2(CONCAT('bench-photo-', e.id, '-', p.seq), 256), 22), e.shop_id, e.job_id, e.id, p.seq - 1, e.author_user_id, 'bench.jpg',
            CONCAT('bench/', e.id, '-', p.seq, '.jpg'), CONCAT('bench/', e.id, '-', p.seq, '-thumb.jpg'), 1600, 1200, 310000, e.created_at
     FROM journal_entries e JOIN seq_1_to_2 p WHERE e.job_id = ? AND e.kind = 'photos'`,
    [jobId],
  );
  await k.raw("UPDATE journal_entries SET kind = 'clip', body = NULL, caption = 'Idle after the clean' WHERE job_id = ? AND id % 20 = 3", [jobId]);
  await k.raw(
    `INSERT INTO clips (public_id, shop_id, job_id, entry_id, uploaded_by_user_id, original_name, bytes, upload_id, asset_id, playback_id, status, duration_seconds, aspect_ratio, created_at, updated_at)
     SELECT LEFT(SHA2(CONCAT('bench-clip-', e.id), 256), 22), e.shop_id, e.job_id, e.id, e.author_user_id, 'idle.mp4', 24000000,
            CONCAT('bench-up-', e.id), CONCAT('bench-asset-', e.id), CONCAT('bench-play-', e.id), 'ready', 42.5, '16:9', e.created_at, e.created_at
     FROM journal_entries e WHERE e.job_id = ? AND e.kind = 'clip'`,
    [jobId],
  );
  await k.raw(
    `INSERT INTO clip_moments (shop_id, clip_id, at_ms, label, created_at)
     SELECT c.shop_id, c.id, 12500, 'Listen for the tick here', c.created_at FROM clips c WHERE c.job_id = ?`,
    [jobId],
  );
}

/** The newest job of the big shop gets LONG_JOB_ENTRIES entries in all. */
async function seedLongJob(k: Knex, shopId: number): Promise<number> {
  const job = await one(k, "SELECT id, (SELECT COUNT(*) FROM journal_entries e WHERE e.job_id = j.id) AS n FROM jobs j WHERE shop_id = ? ORDER BY number DESC LIMIT 1", [shopId]);
  const jobId = Number(job?.id);
  const missing = LONG_JOB_ENTRIES - Number(job?.n);
  if (missing > 0) {
    await k.raw(
      `INSERT INTO journal_entries (shop_id, job_id, kind, visibility, body, created_at, shared_at)
       SELECT ?, ?, 'note', IF(seq % 2 = 0, 'shared', 'shop'), ${note("seq")}, NOW(3) - INTERVAL seq SECOND, IF(seq % 2 = 0, NOW(3) - INTERVAL seq SECOND, NULL)
       FROM seq_1_to_${missing}`,
      [shopId, jobId],
    );
  }
  await mixMedia(k, jobId);
  return jobId;
}

/** Ruth Calloway's 200-entry job at Copper Gulch, every entry shared so both pages show all 200. */
async function seedPageJob(k: Knex): Promise<{ number: number; publicId: string }> {
  const found = await one(k, "SELECT j.id, j.number, j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.concern = ?", [PAGE_JOB_CONCERN]);
  if (found) {
    await mixMedia(k, Number(found.id));
    return { number: Number(found.number), publicId: String(found.public_id) };
  }
  const owner = await one(
    k,
    `SELECT c.shop_id, c.id AS customer_id, m.id AS machine_id, s.next_job_number AS number FROM customers c JOIN shops s ON s.id = c.shop_id
     JOIN machines m ON m.customer_id = c.id WHERE s.slug = 'copper-gulch' AND c.email = 'ruth.calloway@mail.test' LIMIT 1`,
  );
  if (!owner) throw new Error("the demo seed has no Ruth Calloway at Copper Gulch: the page job needs her");
  const tech = await one(k, "SELECT id FROM users WHERE email = 'mateo@coppergulch.test'");
  const number = Number(owner.number);
  const publicId = `bench${String(number).padStart(11, "0")}`;
  await k.transaction(async (tx) => {
    await tx.raw("UPDATE shops SET next_job_number = next_job_number + 1 WHERE id = ?", [owner.shop_id as number]);
    const jobId = Number((await tx("jobs").insert({
      shop_id: Number(owner.shop_id), number, public_id: publicId, customer_id: Number(owner.customer_id), machine_id: Number(owner.machine_id),
      status: "in_progress", concern: PAGE_JOB_CONCERN, technician_user_id: tech ? Number(tech.id) : null,
    }))[0]);
    await tx.raw(
      `INSERT INTO journal_entries (shop_id, job_id, kind, visibility, author_user_id, body, created_at, shared_at)
       SELECT ?, ?, 'note', 'shared', ?, ${note("seq")}, NOW(3) - INTERVAL (${PAGE_JOB_ENTRIES} - seq) * 20 MINUTE, NOW(3) - INTERVAL (${PAGE_JOB_ENTRIES} - seq) * 20 MINUTE
       FROM seq_1_to_${PAGE_JOB_ENTRIES}`,
      [Number(owner.shop_id), jobId, tech ? Number(tech.id) : null],
    );
    const ruth = await one(tx, "SELECT id FROM users WHERE email = 'ruth.calloway@mail.test'");
    await tx("job_subscribers").insert({ shop_id: Number(owner.shop_id), job_id: jobId, email: "ruth.calloway@mail.test", user_id: ruth ? Number(ruth.id) : null, role: "owner" });
    await mixMedia(tx, jobId);
  });
  return { number, publicId };
}

export type BenchData = { bigShopId: number; smallShopId: number; longJobId: number; pageJob: { number: number; publicId: string }; storySlug: string };

export async function seedBench(k: Knex, storageDir: string, log: (s: string) => void): Promise<BenchData> {
  const bigShopId = await seedScaleShop(k, SCALE_SHOPS.big.slug, SCALE_SHOPS.big.jobs, log);
  const smallShopId = await seedScaleShop(k, SCALE_SHOPS.small.slug, SCALE_SHOPS.small.jobs, log);
  const longJobId = await seedLongJob(k, bigShopId);
  const pageJob = await seedPageJob(k);
  const storySlug = await seedStory(k, storageDir, log);
  await k.raw("ANALYZE TABLE jobs, customers, machines, journal_entries, job_status_changes");
  return { bigShopId, smallShopId, longJobId, pageJob, storySlug };
}
