import mysql from "mysql2/promise";
import { CUSTOMERS } from "./personas";

// The end-to-end tests' window on the database under test (DATABASE_URL, set by `npm test`):
// for reading ids the pages don't show and for setting up or undoing test data.

export async function sql(query: string, params: unknown[] = []): Promise<mysql.RowDataPacket[]> {
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  try {
    const [rows] = await db.query<mysql.RowDataPacket[]>(query, params);
    return rows;
  } finally {
    await db.end();
  }
}

/** The owner-facing id of a demo job, by its number in the Copper Gulch shop. */
export async function publicIdOf(number: number, shop = "copper-gulch"): Promise<string> {
  const [row] = await sql("SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = ? AND j.number = ?", [shop, number]);
  if (!row) throw new Error(`no job ${number} in ${shop}`);
  return String(row.public_id);
}

/**
 * A new job in the demo shop for the demo owner's first machine, numbered as check-in would, in
 * "inspecting". It stays in the shop: specs that make one run after staff.spec.ts (name order).
 */
export async function newDemoJob(prefix: string, concern: string, shopSlug = "copper-gulch"): Promise<{ number: number; publicId: string }> {
  const [shop] = await sql("SELECT id, next_job_number FROM shops WHERE slug = ?", [shopSlug]);
  const number = Number(shop!.next_job_number);
  await sql("UPDATE shops SET next_job_number = next_job_number + 1 WHERE id = ? AND next_job_number = ?", [shop!.id, number]);
  const [customer] = await sql("SELECT c.id, m.id AS machine_id FROM customers c JOIN machines m ON m.customer_id = c.id WHERE c.shop_id = ? AND c.email = ? ORDER BY m.id LIMIT 1", [
    shop!.id,
    CUSTOMERS.jobCustomer.email,
  ]);
  const publicId = `${prefix}${Date.now().toString(36)}`.padEnd(16, "0").slice(0, 16);
  await sql("INSERT INTO jobs (shop_id, number, public_id, customer_id, machine_id, status, concern) VALUES (?, ?, ?, ?, ?, 'inspecting', ?)", [
    shop!.id,
    number,
    publicId,
    customer!.id,
    customer!.machine_id,
    concern,
  ]);
  const [job] = await sql("SELECT id FROM jobs WHERE public_id = ?", [publicId]);
  await sql("INSERT INTO job_status_changes (shop_id, job_id, from_status, to_status, cause) VALUES (?, ?, NULL, 'inspecting', 'manual')", [shop!.id, job!.id]);
  return { number, publicId };
}
