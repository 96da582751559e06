// The test point ↔ node map of a model version (fe/point-links.ts): automatic by label or nearest
// node, or edited by hand; both refuse geometry and model of different units or axes (422).
import { feAutoMapSchema, feMapEditSchema } from '@resonote/contracts';
import type { Deps } from './deps.ts';
import { autoMap, editMap } from '../fe/point-links.ts';

export function registerFeMapRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models/:modelId/map/auto',
    tag: 'Model',
    access: 'lead',
    summary: "Link every active test point to a model node, by label or by the nearest node within toleranceMm; replaces the stored map. Refuses (422) when the geometry and the model differ in size by more than 10× or are flat along different axes",
    body: feAutoMapSchema,
    returns: '{ map: { version, links: [{ point, node, distanceMm, source, sharedWith }] }, linked, unlinked }',
    handler: ({ body, params, campaign: access, user: me }) => autoMap(db, access, params.modelId!, body, me),
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/fe-models/:modelId/map',
    tag: 'Model',
    access: 'lead',
    summary: 'Edit links of the map by hand: { version, links: [{ point, node | null }] }; the units and axes check applies',
    body: feMapEditSchema,
    handler: ({ body, params, campaign: access, user: me }) => editMap(db, access, params.modelId!, body, me),
  });
}
