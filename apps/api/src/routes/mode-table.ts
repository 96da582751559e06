// The campaign's mode table (modes/mode-table.ts, modes/table-change.ts): read it with the MAC and
// the geometry, add a fit's computed modes, remove a row, and synthesize an FRF from all its rows.
import { z } from 'zod';
import { modeTableChangeSchema } from '@resonote/contracts';
import type { Deps } from './deps.ts';
import { loadFit } from '../modes/frf-set.ts';
import { synthesisQuerySchema, tableSynthesis } from '../modes/synthesis-view.ts';
import { addToTable, addToTableSchema, modeTableAnswer, removeFromTable } from '../modes/table-change.ts';

export function registerModeTableRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes',
    tag: 'Modes',
    access: 'viewer',
    summary: "The campaign's mode table (modes taken from one or several fits, each with its fit, band, references, order and input hash), the MAC matrix over shared DOFs, and the geometry for the animation",
    handler: async ({ campaign: access }) => modeTableAnswer(db, access),
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/modes/table',
    tag: 'Modes',
    access: 'lead',
    summary: "Add modes of a fit (its computed modes, by number) to the campaign's mode table; the same mode found twice is pointed out. baseVersion is the table version last read (0 for a table not yet started)",
    body: addToTableSchema,
    status: 201,
    response: modeTableChangeSchema,
    handler: async ({ body, campaign: access, user: me }) => addToTable(db, await loadFit(db, access.campaignId, body.fitId), access, body, me),
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/modes/table/:rowId',
    tag: 'Modes',
    access: 'lead',
    summary: "Remove a row from the campaign's mode table (the fit keeps its modes). ?baseVersion= is the table version last read",
    query: z.strictObject({ baseVersion: z.coerce.number().int().min(0) }),
    response: modeTableChangeSchema,
    handler: async ({ params, query, campaign: access, user: me }) => removeFromTable(db, access, params, query, me),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/synthesis',
    tag: 'Modes',
    access: 'viewer',
    summary: "A measured FRF against the one synthesized from every mode of the campaign's mode table (no residual terms), over the whole band the table's fits cover",
    query: synthesisQuerySchema,
    handler: async ({ query, campaign: access }) => tableSynthesis(db, access, query),
  });
}
