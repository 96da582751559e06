// Optimistic concurrency: a write names the version it read; a stale write answers 409 with the
// current state, so two people editing the plan lose nothing silently.
import { HttpError } from '../errors.ts';

export function staleWrite(what: string, current: unknown): HttpError {
  return new HttpError(409, 'stale-version', `${what} was changed by someone else since you loaded it. Your change was not saved; the current state is attached.`, { current });
}
