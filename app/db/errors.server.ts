/**
 * PostgreSQL's SQLSTATE of a failed query, whether it came straight from pg
 * or wrapped by Drizzle (which keeps pg's error as `cause`).
 */
function sqlState(error: unknown): string | undefined {
  const e = error as { code?: unknown; cause?: { code?: unknown } } | null;
  const code = e?.code ?? e?.cause?.code;
  return typeof code === "string" ? code : undefined;
}

/** A unique index refused the write (23505): someone else got there first. */
export function isUniqueViolation(error: unknown): boolean {
  return sqlState(error) === "23505";
}
