/** What an AppError-throwing call refused with (code, message, per-field messages), or `{ code: "no failure" }`. */
export async function refusalOf(work: Promise<unknown>): Promise<{ code?: string; message?: string; fields?: Record<string, string[]> }> {
  try {
    await work;
  } catch (error) {
    const e = error as { code?: string; message?: string; fields?: Record<string, string[]> };
    return { code: e.code, message: e.message, fields: e.fields };
  }
  return { code: "no failure" };
}
