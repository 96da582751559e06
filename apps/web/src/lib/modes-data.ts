// Types and queries of the Modes screen: background modal fits (polled while they run), the
// chosen modes of a fit, synthesized FRFs, and the campaign's current modes with its geometry.
import { useQuery } from '@tanstack/react-query';
import { api } from './api.ts';

export type StabilityClass = 'new' | 'freq' | 'freq-damp' | 'all';

export interface DiagramPole {
  fHz: number;
  zeta: number;
  stable: StabilityClass;
  lambda: { re: number; im: number };
}
export interface DiagramOrder {
  order: number;
  poles: DiagramPole[];
}
export interface PoleRef {
  order: number;
  index: number;
}

export interface ShapeValue {
  dof: string;
  re: number;
  im: number;
  real: number;
}
export interface ModeRow {
  mode: number;
  fHz: number;
  zetaPercent: number;
  estimated: { fHz: number; zetaPercent: number };
  mpc: number;
  pole?: PoleRef;
  shape: ShapeValue[];
  /** Unit modal mass (1/√kg) where the fit had a driving point. */
  massShape?: ShapeValue[] | null;
}
/** A row of the campaign's mode table: a mode with the fit it came from. */
export interface TableRow extends ModeRow {
  id: string;
  source: { fitId: string | null; bandHz: [number, number]; references: string[]; order: number; poleIndex: number; inputHash: string };
  massNote: string;
  duplicate: { of: number | null; ofId: string | null; note: string } | null;
  addedAt: string;
}
export interface QualityWarning {
  code: 'cmif-peak-without-column' | 'synthesis-error' | 'low-mpc';
  message: string;
  fHz?: number;
  value?: number;
}
export interface ChosenModes {
  table: ModeRow[];
  mac: number[][];
  synthesisFrac: { response: string; reference: string; frac: number; errorPercent?: number | null }[];
  correction: string;
  massNote?: string;
  warnings?: QualityWarning[];
  axisConvention?: string;
  chosenBy?: string;
  chosenAt?: string;
}
export interface SuggestedMode {
  fHz: number;
  zetaPercent: number;
  representative: PoleRef;
  count: number;
  fSpreadPercent: number;
  zetaSpreadPercent: number;
  minMac: number;
}

export type FitStatus = 'queued' | 'running' | 'done' | 'failed';
export interface ModalFit {
  id: string;
  status: FitStatus;
  progress: number;
  message: string | null;
  request: { bandHz: [number, number]; orders: number[]; frfCount: number; entryIds?: string[] };
  result: { cmif: { f: number[]; values: number[][] }; diagram: { orders: DiagramOrder[] } } | null;
  modes: ChosenModes | null;
  /** Poles chosen but not yet computed, kept on the server; version for optimistic concurrency. */
  draft: { poles: PoleRef[] | null; version: number };
  warnings: QualityWarning[];
  createdAt: string;
  finishedAt: string | null;
  elapsedMs: number | null;
}
export interface FitSummary {
  id: string;
  status: FitStatus;
  progress: number;
  message: string | null;
  createdAt: string;
  finishedAt: string | null;
  elapsedMs: number | null;
  bandHz: [number, number];
  maxOrder: number;
  frfCount: number;
  modeCount: number;
}

export interface CurrentModes {
  /** Version of the campaign's mode table (0 before the first row). */
  version: number;
  modes: TableRow[];
  mac: number[][];
  bandHz: [number, number] | null;
  fitIds: string[];
  duplicateRule: string;
  axisConvention: string;
  warnings: QualityWarning[];
  points: { id: string; label: string; x: number; y: number; z: number }[];
  lines: { pointA: string; pointB: string }[];
}

export interface Synthesis {
  kind: string;
  unit: string;
  f: number[];
  measured: { re: number[]; im: number[] };
  synthesized: { re: number[]; im: number[] };
  modesUsed?: number[];
  modesWithoutThisFrf?: number[];
  note?: string;
}

export const modeKeys = {
  current: (id: string) => ['campaign', id, 'modes'] as const,
  fits: (id: string) => ['campaign', id, 'modes', 'fits'] as const,
  fit: (id: string, fitId: string) => ['campaign', id, 'modes', 'fit', fitId] as const,
  // The key names the computed pole set (chosenAt changes with every "Compute shapes"), so a
  // synthesis of an earlier pole set is never shown for a newer one.
  synthesis: (id: string, fitId: string, chosenAt: string, response: string, reference: string) => ['campaign', id, 'modes', 'fit', fitId, 'synthesis', chosenAt, response, reference] as const,
  // …and the table's version, for the synthesis from the campaign's mode table.
  tableSynthesis: (id: string, version: number, response: string, reference: string) => ['campaign', id, 'modes', 'table-synthesis', version, response, reference] as const,
};

export const useCurrentModes = (id: string) => useQuery({ queryKey: modeKeys.current(id), queryFn: () => api<CurrentModes>(`/campaigns/${id}/modes`) });
export const useFits = (id: string) => useQuery({ queryKey: modeKeys.fits(id), queryFn: () => api<{ fits: FitSummary[] }>(`/campaigns/${id}/modes/fits`) });

/** One fit, polled every 500 ms while it is queued or running. */
export const useFit = (id: string, fitId: string | null) =>
  useQuery({
    queryKey: modeKeys.fit(id, fitId ?? ''),
    queryFn: () => api<{ fit: ModalFit }>(`/campaigns/${id}/modes/fits/${fitId}`),
    enabled: Boolean(fitId),
    refetchInterval: (q) => {
      const s = q.state.data?.fit.status;
      return s === 'queued' || s === 'running' ? 500 : false;
    },
    refetchOnWindowFocus: false,
  });

const pairQuery = (pair: { response: string; reference: string }) => `response=${encodeURIComponent(pair.response)}&reference=${encodeURIComponent(pair.reference)}&kind=accelerance`;

/** Measured against synthesized from the modes computed in one fit (with its residual terms). */
export const useSynthesis = (id: string, fitId: string | null, chosenAt: string | null, pair: { response: string; reference: string } | null) =>
  useQuery({
    queryKey: modeKeys.synthesis(id, fitId ?? '', chosenAt ?? '', pair?.response ?? '', pair?.reference ?? ''),
    queryFn: () => api<Synthesis>(`/campaigns/${id}/modes/fits/${fitId}/synthesis?${pairQuery(pair!)}`),
    enabled: Boolean(fitId && chosenAt && pair),
    refetchOnWindowFocus: false,
  });

/** Measured against synthesized from every mode of the campaign's mode table, over the whole band. */
export const useTableSynthesis = (id: string, version: number, pair: { response: string; reference: string } | null) =>
  useQuery({
    queryKey: modeKeys.tableSynthesis(id, version, pair?.response ?? '', pair?.reference ?? ''),
    queryFn: () => api<Synthesis>(`/campaigns/${id}/modes/synthesis?${pairQuery(pair!)}`),
    enabled: Boolean(version > 0 && pair),
    refetchOnWindowFocus: false,
  });

/** A DOF label such as `B05:+Z`: the point, the axis and the sign of the measured direction. */
export function parseDof(dof: string): { label: string; axis: 'x' | 'y' | 'z'; sign: 1 | -1 } | null {
  const m = /^(.+):([+-])([XYZxyz])$/.exec(dof.trim());
  if (!m) return null;
  return { label: m[1]!, axis: m[3]!.toLowerCase() as 'x' | 'y' | 'z', sign: m[2] === '-' ? -1 : 1 };
}

/**
 * How each stability class is drawn: a plotly marker symbol AND a colour, so the class never
 * rests on colour alone. Filled and larger as the pole passes more checks.
 */
export const stabilityLook: Record<StabilityClass, { label: string; glyph: string; symbol: string; size: number; light: string; dark: string }> = {
  new: { label: 'new pole', glyph: '○', symbol: 'circle-open', size: 6, light: '#8a9593', dark: '#6f7b79' },
  freq: { label: 'stable in frequency', glyph: '△', symbol: 'triangle-up-open', size: 7, light: '#9a6700', dark: '#d19a2a' },
  'freq-damp': { label: 'frequency and damping', glyph: '□', symbol: 'square-open', size: 7, light: '#1f5fa8', dark: '#6fa8e8' },
  all: { label: 'all (frequency, damping and vector)', glyph: '◆', symbol: 'diamond', size: 8, light: '#2f7d32', dark: '#5fb563' },
};
export const stabilityOrder: StabilityClass[] = ['new', 'freq', 'freq-damp', 'all'];

export const samePole = (a: PoleRef, b: PoleRef) => a.order === b.order && a.index === b.index;

export const fmtHz = (f: number) => (f >= 100 ? f.toFixed(1) : f.toFixed(2));
export const fmtPct = (z: number) => z.toFixed(z < 1 ? 3 : 2);
