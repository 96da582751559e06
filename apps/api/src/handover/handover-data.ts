// The shape of the hand-over data (collect.ts reads it; the report, the bundles and the shared link render it).
import type { campaign } from '@resonote/db/schema';
import type { CalibrationState } from '@resonote/contracts';
import type { EntryWithResult, ValidityChecks } from '../hits/campaign-checks.ts';
import type { CurrentSettings } from '../hits/current-settings.ts';
import type { Correlation } from '../fe/correlation.ts';
import type { rowView } from '../modes/mode-table.ts';
import type { HandoverNote } from './notes.ts';

export interface HandoverEntry {
  id: string;
  position: number;
  responseDof: string;
  excitationDof: string;
  drivingPoint: boolean;
  status: string;
  requiredHits: number;
  assignee: string | null;
  note: string;
  acceptedHits: number;
  rejectedHits: number;
}

export type HandoverFrf = EntryWithResult<HandoverEntry>;

export interface HandoverKitItem {
  id: string;
  kind: 'hammer' | 'accelerometer';
  model: string;
  serial: string;
  sensitivity: number;
  sensitivityUnit: string;
  sensitivityBase: number;
  sensitivityBaseUnit: 'mV/N' | 'mV/(m/s²)';
  tips: string[];
  axes: string[];
  retired: boolean;
  latest: { calibratedOn: string; dueOn: string; certificateRef: string; performedBy: string } | null;
  calibrationCount: number;
  /** Calibration state on the day of the last recorded hit (or today when nothing was recorded). */
  stateAtTest: { state: CalibrationState; days: number | null; on: string };
  stateToday: { state: CalibrationState; days: number | null; on: string };
}

export type ModeRow = ReturnType<typeof rowView>;

/** The campaign's mode table for the hand-over: rows from one or several fits, and where each fit came from. */
export interface HandoverModes {
  table: ModeRow[];
  mac: number[][];
  fits: { fitId: string; inputHash: string; bandHz: [number, number]; settingsVersion: number; resultHashes: string[]; entryIds: string[]; frfCount: number; correction: string; chosenBy: string; chosenAt: string }[];
  duplicateRule: string;
  axisConvention: string;
}

export interface HandoverCorrelation {
  model: { id: string; name: string; versionLabel: string; normalisation: string; uploadedAt: Date; nodeCount: number; modeCount: number };
  result: Correlation;
}

export type HandoverChecks = ValidityChecks;

export interface HandoverData {
  generatedAt: Date;
  campaign: typeof campaign.$inferSelect;
  leads: string[];
  points: { id: string; label: string; x: number; y: number; z: number; directions: string[]; retired: boolean }[];
  lines: { id: string; pointA: string; pointB: string }[];
  schedule: HandoverEntry[];
  kit: HandoverKitItem[];
  channels: { channel: number; kind: string; model: string; serial: string; axis: string | null; dof: string | null; sign: number; label: string }[];
  settings: CurrentSettings & { history: { version: number; settings: unknown; reason: string; createdAt: Date; createdBy: string | null }[] };
  hits: {
    total: number;
    accepted: number;
    rejected: number;
    overridden: number;
    /** Hits set aside by a redo of their DOF: kept, and left out of every other count here. */
    setAside: number;
    byReason: { code: string; n: number }[];
    byEngineer: { name: string; hits: number; accepted: number; rejected: number }[];
    firstAt: Date | null;
    lastAt: Date | null;
  };
  /** Background-noise checks, oldest first: per channel the RMS in the band, the peak and the reading in words. */
  noise: { at: Date; by: string | null; source: string; durationS: number; channels: { channel: number; role: 'force' | 'response'; dof: string; unit: string; rmsInBand: number; peak: number; status: 'ok' | 'caution'; message: string }[] }[];
  frfs: HandoverFrf[];
  checks: HandoverChecks | null;
  modes: HandoverModes | null;
  /** Correlation of the mode table with the campaign's newest FE model version; null without a model. */
  correlation: HandoverCorrelation | null;
  /** Notes and photos per DOF, oldest first. */
  notes: HandoverNote[];
}

