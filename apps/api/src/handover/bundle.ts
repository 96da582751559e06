// The hand-over bundle: geometry, schedule, every averaged FRF with coherence, modes, settings
// and kit, with a README (bundle-readme.ts) that says what every column is and where each number
// comes from. The same content goes out as a zip of CSV/JSON files (bundle-zip.ts) or as one JSON
// document (bundleJson); raw hits are bundle-raw.ts.
import type { HandoverData } from './handover-data.ts';
import { fileSafe } from './bundle-csv.ts';
import type { RawHit } from './bundle-raw.ts';
import { BUNDLE_FORMAT, BUNDLE_VERSION, readme } from './bundle-readme.ts';

export interface BundleFrf {
  file: string;
  entryId: string;
  responseDof: string;
  excitationDof: string;
  drivingPoint: boolean;
  averages: number;
  settingsVersion: number;
  inputHash: string;
  hitIds: string[];
  meanCoherenceInBand: number;
  unit: '(m/s²)/N';
  f: number[];
  h1: { re: number[]; im: number[] };
  h2: { re: number[]; im: number[] };
  coherence: number[];
}

/** The bundle as plain data: what both the zip and the JSON document are made of. */
export function bundleContent(d: HandoverData) {
  const labels = new Map(d.points.map((p) => [p.id, p.label]));
  const used = new Set<string>();
  const frfs: BundleFrf[] = d.frfs.flatMap((x) =>
    x.result.channels.map((ch, i) => {
      let file = `frf/${fileSafe(ch.dof)}_${fileSafe(x.result.excitationDof)}.csv`;
      // Two entries measuring the same pair (a repeat) get the schedule position appended.
      if (used.has(file)) file = file.replace(/\.csv$/, `_${x.entry.position}.csv`);
      used.add(file);
      return {
        file,
        entryId: x.entry.id,
        responseDof: ch.dof,
        excitationDof: x.result.excitationDof,
        drivingPoint: x.entry.drivingPoint,
        averages: x.result.averages,
        settingsVersion: x.result.settingsVersion,
        inputHash: x.result.inputHash,
        hitIds: x.result.hitIds,
        meanCoherenceInBand: ch.meanCoherence,
        unit: '(m/s²)/N' as const,
        f: Array.from(x.result.frf.f),
        h1: { re: Array.from(x.result.frf.h1[i]!.re), im: Array.from(x.result.frf.h1[i]!.im) },
        h2: { re: Array.from(x.result.frf.h2[i]!.re), im: Array.from(x.result.frf.h2[i]!.im) },
        coherence: Array.from(x.result.frf.coherence[i]!),
      };
    }),
  );
  const c = d.campaign;
  return {
    campaign: { id: c.id, name: c.name, structure: c.structure, client: c.client, purpose: c.purpose, testType: c.testType, referenceDofs: c.referenceDofs, status: c.status, notes: c.notes, leads: d.leads, lengthUnit: 'mm' },
    geometry: {
      unit: 'mm',
      points: d.points.map((p) => ({ label: p.label, x: p.x, y: p.y, z: p.z, directions: p.directions, retired: p.retired })),
      lines: d.lines.map((l) => ({ pointA: labels.get(l.pointA) ?? l.pointA, pointB: labels.get(l.pointB) ?? l.pointB })),
    },
    schedule: d.schedule.map((e) => ({ ...e, frfFiles: frfs.filter((x) => x.entryId === e.id).map((x) => x.file) })),
    frfs,
    modes: d.modes
      ? {
          axisConvention: d.modes.axisConvention,
          duplicateRule: d.modes.duplicateRule,
          table: d.modes.table.map((m) => ({ mode: m.mode, fHz: m.fHz, zetaPercent: m.zetaPercent, mpc: m.mpc, estimated: m.estimated, source: m.source, shape: m.shape, massShape: m.massShape, massNote: m.massShape ? '' : m.massNote, duplicate: m.duplicate })),
          mac: d.modes.mac,
          fits: d.modes.fits,
        }
      : null,
    settings: { currentVersion: d.settings.version, current: d.settings.settings, history: d.settings.history },
    kit: { items: d.kit, channels: d.channels },
    noise: d.noise.map((n) => ({ recordedAt: n.at.toISOString(), recordedBy: n.by, source: n.source, durationS: n.durationS, channels: n.channels })),
    correlation: d.correlation ? { model: { ...d.correlation.model, uploadedAt: d.correlation.model.uploadedAt.toISOString() }, ...d.correlation.result } : null,
  };
}

export type BundleContent = ReturnType<typeof bundleContent>;

export function bundleJson(d: HandoverData, raw: RawHit[] | null) {
  return { format: BUNDLE_FORMAT, version: BUNDLE_VERSION, exportedAt: d.generatedAt.toISOString(), readme: readme(d, raw !== null), ...bundleContent(d), hits: raw };
}
