// FE model versions, their point ↔ node map, the plan proposal and the correlation, as the API serves them.
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from './api.ts';

export interface FeModelSummary {
  id: string;
  name: string;
  versionLabel: string;
  fileUnits: { length: string; frequency: string; mass: string };
  normalisation: 'mass' | 'none';
  sourceFormat: 'csv' | 'json';
  sourceFileName: string;
  sourceBytes: number;
  nodeCount: number;
  modeCount: number;
  mapVersion: number;
  uploadedAt: string;
}

export interface FeLink {
  point: string;
  node: string | null;
  distanceMm: number | null;
  source: 'label' | 'nearest' | 'manual';
  sharedWith: string[];
}

export interface FeModelDetail {
  model: FeModelSummary;
  nodes: { label: string; x: number; y: number; z: number }[];
  modes: { number: number; frequencyHz: number; modalMassKg: number | null }[];
  map: { version: number; links: FeLink[] };
}

export interface FeProposal {
  modes: { number: number; frequencyHz: number }[];
  candidates: { kind: 'nodes' | 'points'; axes: string[]; count: number };
  sensors: number;
  kept: { dof: string; node: string; x: number; y: number; z: number; ed: number; rank: number }[];
  informationKept: number;
  reference: { dof: string; product: number; minimum: number; weakestMode: number };
  referenceAlternatives: { dof: string; product: number; minimum: number; weakestMode: number }[];
  referenceWords: string;
  autoMac: { matrix: number[][]; maxOffDiagonal: { a: number; b: number; value: number } | null; above: { a: number; b: number; value: number }[]; threshold: number; words: string };
  method: string;
}

export interface FeProblem {
  row: number | null;
  column: string | null;
  path: string | null;
  message: string;
}

export type FeCorrelation =
  | { ok: false; why: string; source: string }
  | {
      ok: true;
      source: string;
      minMac: number;
      dofs: string[];
      testModes: { mode: number; fHz: number }[];
      modelModes: { number: number; frequencyHz: number }[];
      mac: number[][];
      pairs: { testMode: number; modelMode: number; testHz: number; modelHz: number; mac: number; frequencyDifferencePercent: number | null }[];
      unpairedTest: number[];
      unpairedModel: number[];
      crossOrthogonality: { ok: true; method: string; matrix: number[][]; diagonal: number[]; maxOffDiagonal: number | null; words: string } | { ok: false; why: string };
      words: string;
      method: string;
    };

export const feKeys = {
  list: (c: string) => ['fe-models', c] as const,
  one: (c: string, m: string) => ['fe-models', c, m] as const,
  correlation: (c: string, m: string) => ['fe-models', c, m, 'correlation'] as const,
};

export const useFeModels = (campaignId: string) => useQuery({ queryKey: feKeys.list(campaignId), queryFn: () => api<{ models: FeModelSummary[] }>(`/campaigns/${campaignId}/fe-models`) });
export const useFeModel = (campaignId: string, modelId: string | undefined) =>
  useQuery({ queryKey: feKeys.one(campaignId, modelId ?? ''), queryFn: () => api<FeModelDetail>(`/campaigns/${campaignId}/fe-models/${modelId}`), enabled: Boolean(modelId) });
/** The correlation against one model version; `tableVersion` (the mode table's) is in the key, so a change of the table refetches it. */
export const useCorrelation = (campaignId: string, modelId: string | undefined, tableVersion: number | undefined) =>
  useQuery({ queryKey: [...feKeys.correlation(campaignId, modelId ?? ''), tableVersion ?? -1], queryFn: () => api<{ correlation: FeCorrelation }>(`/campaigns/${campaignId}/fe-models/${modelId}/correlation`), enabled: Boolean(modelId) && tableVersion !== undefined, placeholderData: keepPreviousData });
