// The steps every route that reads or changes one stored row repeats: an id from the path that is
// no uuid names nothing (404, the same answer as an unknown id, never a database error); the row
// is read, locked inside the transaction when it will change, and 404 when missing; a write names
// the version it read (409 with the current state when stale, http/concurrency.ts); a unique
// index that refuses a row is a 409 in words.
import { uuidSchema } from '@resonote/contracts';
import { notFound } from '../errors.ts';
import { staleWrite } from './concurrency.ts';

/** The path parameter as a uuid, or 404 "`what` was not found". */
export function pathId(value: string | undefined, what: string): string {
  const parsed = uuidSchema.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

/** The first row of a query's answer, or 404 "`what` was not found". */
export async function oneOr404<T>(rows: Promise<T[]> | T[], what: string): Promise<T> {
  const [row] = await rows;
  if (!row) throw notFound(what);
  return row;
}

/** Refuses a write that names another version than the stored row's (409 with `current`, the row by default). */
export function expectVersion(row: { version: number }, version: number, what: string, current: unknown = row): void {
  if (row.version !== version) throw staleWrite(what, current);
}

/** PostgreSQL's unique_violation (23505), directly or as the cause Drizzle wraps. */
export function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } } | null;
  return e?.code === '23505' || e?.cause?.code === '23505';
}
