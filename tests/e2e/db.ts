import mysql from "mysql2/promise";

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
