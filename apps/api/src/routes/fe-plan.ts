// Planning with a model version and checking against it: the pre-test proposal (fe/proposal.ts),
// accepting it into geometry and schedule (fe/accept-plan.ts), and the correlation of the mode
// table with the model (fe/correlation.ts).
import { feAcceptSchema, feCorrelationQuerySchema, feProposalSchema } from '@resonote/contracts';
import type { Deps } from './deps.ts';
import { acceptPlan } from '../fe/accept-plan.ts';
import { correlate, testModesForCorrelation } from '../fe/correlation.ts';
import { activePoints } from '../fe/point-links.ts';
import { proposePlan } from '../fe/proposal.ts';
import { loadModel, modelSummary } from '../fe/store.ts';

export function registerFePlanRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models/:modelId/proposal',
    tag: 'Model',
    access: 'viewer',
    // Computes and stores nothing, so an archived campaign answers it too.
    whileArchived: 'allowed',
    summary: 'Propose where to measure and where to put the reference: Effective Independence (Kammer 1991) over the candidate DOFs for the modes of interest, the driving-point measure, and the auto-MAC of the kept set against a threshold (0.2 default, common practice). Stores nothing',
    body: feProposalSchema,
    returns: '{ modes, kept: [{ dof, node, x, y, z, ed, rank }], ranking, informationKept, reference, referenceAlternatives, referenceWords, autoMac: { matrix, maxOffDiagonal, above, threshold, words } }',
    handler: async ({ body, params, campaign: access }) => {
      const s = await loadModel(db, access.campaignId, params.modelId!);
      const points = await activePoints(db, access.campaignId);
      return proposePlan(s.model, s.links, points, body);
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models/:modelId/proposal/accept',
    tag: 'Model',
    access: 'lead',
    summary: "Accept a plan: points missing from the geometry are created at their model node's coordinates, each gets the chosen directions, the reference DOF is set (in a roving-hammer test the accelerometer channel at the former reference moves with it), points are linked to their nodes, and the schedule is generated. One transaction, audited",
    body: feAcceptSchema,
    returns: '{ pointsAdded, pointsUpdated, referenceDofs, schedule: { added, removed, kept }, channelsMoved: [{ channel, from, to }], channelNote, entries }',
    handler: ({ body, params, campaign: access, user: me }) => acceptPlan(db, access, params.modelId!, body, me),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models/:modelId/correlation',
    tag: 'Model',
    access: 'viewer',
    summary: "Correlate the campaign's mode table with this model version over the linked DOFs: pairs by MAC with frequency differences in %, the MAC matrix, cross-orthogonality where both sides are mass-normalised",
    query: feCorrelationQuerySchema,
    handler: async ({ query, params, campaign: access }) => {
      const s = await loadModel(db, access.campaignId, params.modelId!);
      const test = await testModesForCorrelation(db, access.campaignId);
      return { model: modelSummary(s.row), correlation: correlate(s.model, s.links, test, query.minMac ?? 0.6) };
    },
  });
}
