// Hits set aside by a redo of their schedule entry (packages/db/src/schema/redo.ts). They stay
// stored with their verdicts; every count, average and status reads only the hits that are not
// set aside, through `notExcluded`.
import { sql } from 'drizzle-orm';
import { hit, hitExclusion } from '@resonote/db/schema';

/** SQL condition: the hit row in scope is not set aside by a redo. */
export const notExcluded = sql`NOT EXISTS (SELECT 1 FROM ${hitExclusion} WHERE ${hitExclusion.hitId} = ${hit.id})`;
