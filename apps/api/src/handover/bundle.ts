// The hand-over bundle: geometry, schedule, every averaged FRF with coherence, modes, settings
// and kit, with a README that says what every column is and where each number comes from.
// The same content goes out as a zip of CSV/JSON files or as one JSON document.
import type { Writable } from 'node:stream';
import { asc, eq, getTableColumns, sql } from 'drizzle-orm';
import { strToU8, Zip, ZipDeflate } from 'fflate';
import { hit, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { ChannelSnapshot } from '../hits/channel-map.ts';
import { unpackSamples } from '../hits/samples-codec.ts';
import type { HandoverData } from './collect.ts';
import { DB_REFERENCE } from './report-html.ts';

export const BUNDLE_FORMAT = 'resonote-handover-bundle';
export const BUNDLE_VERSION = 1;

/** A DOF label as a file-name part: `B21:+Z` → `B21+Z` (only letters, digits, + - _ . kept). */
export const fileSafe = (dof: string) => dof.replace(':', '').replace(/[^A-Za-z0-9+\-_.]/g, '_');

type Cell = string | number | boolean | null | undefined;

function csvCell(v: Cell): string {
  if (v === null || v === undefined) return '';
  // String(number) is the shortest text that reads back as the same double: full precision.
  const s = typeof v === 'number' ? String(v) : String(v);
  return /[",\r\n]/.test(s) || /^\s|\s$/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The shortest decimal text that reads back (through float32 rounding) as the same float32 value. */
export function f32Text(v: number): string {
  // Quantized samples can be −0; keep its sign so the float32 bytes come back identical.
  if (Object.is(v, -0)) return '-0';
  for (let p = 6; p < 9; p++) {
    const t = Number(v.toPrecision(p));
    if (Math.fround(t) === v) return String(t);
  }
  return String(Number(v.toPrecision(9)));
}

export function toCsv(header: string[], rows: Cell[][]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

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

export interface RawHit {
  file: string;
  hitId: string;
  entryId: string;
  sequence: number;
  verdict: string;
  reasons: { code: string; message?: string }[];
  settingsVersion: number;
  sampleRateHz: number;
  samples: number;
  recordedAt: string;
  recordedBy: string | null;
  sha256: string;
  channels: { channel: number; role: string; dof: string; unit: string; sign: number; model: string; serial: string; sensitivityBase: number; calibration: unknown }[];
  values?: number[][];
}

export function readme(d: HandoverData, raw: boolean): string {
  const c = d.campaign;
  return `Resonote hand-over bundle (${BUNDLE_FORMAT}, version ${BUNDLE_VERSION})
=====================================================

Campaign:   ${c.name}
Structure:  ${c.structure || '-'}
Client:     ${c.client || '-'}
Campaign id ${c.id}
Exported:   ${d.generatedAt.toISOString()}
Settings:   version ${d.settings.version} (of ${d.settings.history.length} saved versions; see settings.json)

Conventions
-----------
- FRF H_ij = response at DOF i / force at DOF j, written H(response, excitation).
- DOF label: <point label>:<signed axis>, e.g. B05:+Z, in a right-handed global frame.
  In file names the colon is dropped: frf/B21+Z_B05+Z.csv is H(B21:+Z, B05:+Z).
- Time dependence e^{+jwt}; spectra X(f) = dt * sum x_n e^{-j 2 pi k n / N}.
- The hammer force is positive in compression (along the strike direction). A sensor mounted
  against its DOF direction is recorded with sign -1, corrected before averaging.
- Units: coordinates mm; frequency Hz; force N; acceleration m/s^2; FRFs are accelerance in
  (m/s^2)/N; damping in % of critical; sensitivities mV/N (hammer), mV/(m/s^2) (accelerometers).
- Magnitudes in the report are ${DB_REFERENCE} (20*log10 |H|). The files hold complex values, not dB.
- Estimators over the accepted hits of an entry (one triggered record = one average, no overlap):
  G_ff = mean |F|^2, G_xx = mean |X|^2, G_fx = mean conj(F)*X  (windows applied first)
  H1 = G_fx / G_ff,  H2 = G_xx / G_xf (G_xf = conj(G_fx)),  coherence = |G_fx|^2 / (G_ff G_xx), 0..1.
- Numbers are written with full double precision (shortest text that reads back exactly).

Files
-----
README.txt        this file
campaign.json     campaign summary: name, structure, client, purpose, test type, reference DOFs, notes
geometry.csv      label,x_mm,y_mm,z_mm,directions   (directions space-separated, e.g. "+Z -X")
lines.csv         point_a,point_b   (labels of the two points each line joins)
schedule.csv      position,response_dof,excitation_dof,driving_point,status,required_hits,
                  accepted_hits,rejected_hits,assignee,note,entry_id,frf_files
frf/index.csv     file,response_dof,excitation_dof,entry_id,averages,settings_version,input_hash,
                  mean_coherence_in_band,hit_ids   (hit_ids space-separated)
frf/<response>_<excitation>.csv
                  frequency_hz,h1_re,h1_im,h2_re,h2_im,coherence
                  every spectral line from 0 Hz to half the sample rate (df = sample rate / samples);
                  H1, H2 accelerance in (m/s^2)/N; coherence dimensionless 0..1.
modes.csv         the campaign's mode table, one row per mode (from one or several fits):
                  mode,f_hz,zeta_percent,mpc,f_hz_before_window_correction,
                  zeta_percent_before_window_correction,fit_id,band_low_hz,band_high_hz,
                  references,model_order,pole_index,fit_input_hash,mass_normalised,found_twice_as_mode
                  (f and zeta are corrected for the exponential window: sigma_true = sigma_est - 1/tau;
                  found_twice_as_mode: the mode number that already holds this mode, frequencies
                  within 1 % and MAC >= 0.9 over the shared DOFs, common practice)
mode-shapes.csv   long format, one row per mode and DOF: mode,dof,re,im,real
                  re/im: unit-normalised complex shape (largest entry 1); real: its best real fit.
mode-shapes-mass-normalised.csv
                  mode,dof,re,im,real in 1/sqrt(kg) (unit modal mass, from the driving-point residue,
                  Ewins 2000; real: rotated so the driving point is real and positive); only modes
                  whose fit had a driving point; none for the others (modes.csv mass_normalised=no).
                  Directions: every DOF is on the positive axis of its point (+X, +Y, +Z); a DOF
                  measured as -Z had its values multiplied by -1 (H(i,-d) = -H(i,+d)).
mac.csv           the MAC matrix of the table's shapes over the DOFs each pair shares
correlation.csv   test modes paired with the newest FE model version by MAC (Allemang & Brown 1982),
                  highest MAC first: test_mode,test_hz,model_mode,model_hz,frequency_difference_percent,mac
                  (difference = (f_test - f_model)/f_model x 100); only when the campaign holds a model
correlation.json  the same with the model version, the DOFs compared, the full MAC matrix (test rows,
                  model columns), unpaired modes and cross-orthogonality (SEREP-reduced mass,
                  O'Callahan, Avitabile & Riemer 1989) where both sides are mass-normalised
settings.json     { currentVersion, current, history: [{ version, settings, reason, createdAt, createdBy }] }
                  field names carry their units (sampleRateHz, recordLengthS, triggerLevelN, ...)
kit.json          hammers and accelerometers with sensitivities (as entered and in base units),
                  latest calibration and its state at test time; the channel map
noise.csv         background-noise checks, one row per check and channel: recorded_at,recorded_by,
                  source,duration_s,channel,role,dof,unit,rms_in_band,peak,status,reading
                  (rms_in_band and peak in the channel's unit, N or m/s^2; Welch PSD, Hann, mean removed)
${
  raw
    ? `hits/index.csv    one row per hit (accepted and rejected): file,hit_id,entry_id,sequence,verdict,reasons,
                  settings_version,sample_rate_hz,samples,recorded_at,recorded_by,sha256,channels
hits/<response>_<excitation>/<sequence>.csv
                  time_s, then one column per channel in storage order (force first):
                  ch<n>_force_N_<dof>, ch<n>_response_ms2_<dof>. t = 0 at the record start; the
                  trigger is at the pre-trigger time. Values are the stored float32 samples in
                  engineering units (volts / sensitivity), before offset removal and windows,
                  written as the shortest decimal that rounds back to the same float32.
                  sha256 in hits/index.csv is over the stored float32 little-endian bytes.
`
    : `(raw time data: export again with ?raw=1 to add hits/)
`
}
Where every number comes from
-----------------------------
- Each FRF file is the average of the accepted hits listed in frf/index.csv (hit_ids), processed
  with settings version settings_version. input_hash = SHA-256 over the settings version and the
  accepted hit ids with their verdict versions: the same hash means the same inputs. Raw hits are
  never changed or deleted in Resonote, so each FRF can be recomputed from them.
- Each mode comes from the modal fit fit_id of its row (modes.csv) with that fit's band, model
  order and input hash; the FRF input hashes each fit used are in the report's appendix B and in
  the JSON bundle (modes.fits).
- The JSON bundle (export/bundle.json) holds exactly the same content as one document.
`;
}

/** The raw-hit index, without sample values: the SHA-256 of each hit's stored bytes comes from PostgreSQL, so no samples are loaded here. */
export async function rawHitIndex(db: Db, d: HandoverData): Promise<RawHit[]> {
  const names = new Map((await db.select({ id: user.id, name: user.name }).from(user)).map((u) => [u.id, u.name]));
  const byEntry = new Map(d.schedule.map((e) => [e.id, e]));
  const { samples: _samples, ...columns } = getTableColumns(hit);
  const rows = await db
    .select({ ...columns, sha256: sql<string>`encode(sha256(${hit.samples}), 'hex')` })
    .from(hit)
    .where(eq(hit.campaignId, d.campaign.id))
    .orderBy(asc(hit.scheduleEntryId), asc(hit.sequence));
  return rows.map((h) => {
    const e = byEntry.get(h.scheduleEntryId);
    const folder = e ? `${fileSafe(e.responseDof)}_${fileSafe(e.excitationDof)}` : h.scheduleEntryId;
    const channels = (h.channels as ChannelSnapshot[]).map((c) => ({ channel: c.channel, role: c.role, dof: c.dof, unit: c.unit, sign: c.sign, model: c.model, serial: c.serial, sensitivityBase: c.sensitivityBase, calibration: c.calibration }));
    return {
      file: `hits/${folder}/${h.sequence}.csv`,
      hitId: h.id,
      entryId: h.scheduleEntryId,
      sequence: h.sequence,
      verdict: h.verdict,
      reasons: h.reasons as RawHit['reasons'],
      settingsVersion: h.settingsVersion,
      sampleRateHz: h.sampleRateHz,
      samples: h.samplesPerChannel,
      recordedAt: h.recordedAt.toISOString(),
      recordedBy: h.recordedBy ? (names.get(h.recordedBy) ?? null) : null,
      sha256: h.sha256,
      channels,
    } satisfies RawHit;
  });
}

/** One hit's stored samples, per channel (float32, engineering units), read on its own. */
async function hitValues(db: Db, h: RawHit): Promise<Float32Array[]> {
  const [row] = await db.select({ samples: hit.samples }).from(hit).where(eq(hit.id, h.hitId));
  if (!row) throw new Error(`hit ${h.hitId} disappeared during the export`);
  return unpackSamples(row.samples, h.channels.length, h.samples);
}

/** The raw-hit index with every hit's values (the JSON bundle's form). */
export async function rawHits(db: Db, d: HandoverData): Promise<RawHit[]> {
  const index = await rawHitIndex(db, d);
  for (const h of index) h.values = (await hitValues(db, h)).map((ch) => Array.from(ch));
  return index;
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

/** Every file of the zip except the raw hits' own CSVs, in order: [name, bytes]. */
function bundleFiles(d: HandoverData, raw: RawHit[] | null): [string, Uint8Array][] {
  const b = bundleContent(d);
  const files: [string, Uint8Array][] = [];
  const put = (name: string, text: string) => files.push([name, strToU8(text)]);
  put('README.txt', readme(d, raw !== null));
  put('campaign.json', JSON.stringify(b.campaign, null, 2));
  put('geometry.csv', toCsv(['label', 'x_mm', 'y_mm', 'z_mm', 'directions'], b.geometry.points.map((p) => [p.label, p.x, p.y, p.z, p.directions.join(' ')])));
  put('lines.csv', toCsv(['point_a', 'point_b'], b.geometry.lines.map((l) => [l.pointA, l.pointB])));
  put(
    'schedule.csv',
    toCsv(
      ['position', 'response_dof', 'excitation_dof', 'driving_point', 'status', 'required_hits', 'accepted_hits', 'rejected_hits', 'assignee', 'note', 'entry_id', 'frf_files'],
      b.schedule.map((e) => [e.position, e.responseDof, e.excitationDof, e.drivingPoint, e.status, e.requiredHits, e.acceptedHits, e.rejectedHits, e.assignee, e.note, e.id, e.frfFiles.join(' ')]),
    ),
  );
  put(
    'frf/index.csv',
    toCsv(
      ['file', 'response_dof', 'excitation_dof', 'entry_id', 'averages', 'settings_version', 'input_hash', 'mean_coherence_in_band', 'hit_ids'],
      b.frfs.map((x) => [x.file, x.responseDof, x.excitationDof, x.entryId, x.averages, x.settingsVersion, x.inputHash, x.meanCoherenceInBand, x.hitIds.join(' ')]),
    ),
  );
  for (const x of b.frfs) {
    put(x.file, toCsv(['frequency_hz', 'h1_re', 'h1_im', 'h2_re', 'h2_im', 'coherence'], x.f.map((fk, k) => [fk, x.h1.re[k], x.h1.im[k], x.h2.re[k], x.h2.im[k], x.coherence[k]])));
  }
  const modes = b.modes;
  put(
    'modes.csv',
    toCsv(
      ['mode', 'f_hz', 'zeta_percent', 'mpc', 'f_hz_before_window_correction', 'zeta_percent_before_window_correction', 'fit_id', 'band_low_hz', 'band_high_hz', 'references', 'model_order', 'pole_index', 'fit_input_hash', 'mass_normalised', 'found_twice_as_mode'],
      (modes?.table ?? []).map((m) => [m.mode, m.fHz, m.zetaPercent, m.mpc, m.estimated.fHz, m.estimated.zetaPercent, m.source.fitId ?? '', m.source.bandHz[0], m.source.bandHz[1], m.source.references.join(' '), m.source.order, m.source.poleIndex, m.source.inputHash, m.massShape ? 'yes' : 'no', m.duplicate?.of ?? '']),
    ),
  );
  put('mode-shapes.csv', toCsv(['mode', 'dof', 're', 'im', 'real'], (modes?.table ?? []).flatMap((m) => m.shape.map((s) => [m.mode, s.dof, s.re, s.im, s.real]))));
  put('mode-shapes-mass-normalised.csv', toCsv(['mode', 'dof', 're', 'im', 'real'], (modes?.table ?? []).flatMap((m) => (m.massShape ?? []).map((s) => [m.mode, s.dof, s.re, s.im, s.real]))));
  put('mac.csv', toCsv(['mode', ...(modes?.table ?? []).map((m) => String(m.mode))], (modes?.mac ?? []).map((row, i) => [i + 1, ...row])));
  if (b.correlation) {
    const k = b.correlation;
    put('correlation.json', JSON.stringify(k, null, 2));
    put('correlation.csv', toCsv(['test_mode', 'test_hz', 'model_mode', 'model_hz', 'frequency_difference_percent', 'mac'], k.ok ? k.pairs.map((p) => [p.testMode, p.testHz, p.modelMode, p.modelHz, p.frequencyDifferencePercent ?? '', p.mac]) : []));
  }
  put('settings.json', JSON.stringify(b.settings, null, 2));
  put('kit.json', JSON.stringify(b.kit, null, 2));
  put(
    'noise.csv',
    toCsv(
      ['recorded_at', 'recorded_by', 'source', 'duration_s', 'channel', 'role', 'dof', 'unit', 'rms_in_band', 'peak', 'status', 'reading'],
      b.noise.flatMap((n) => n.channels.map((ch) => [n.recordedAt, n.recordedBy ?? '', n.source, n.durationS, ch.channel, ch.role, ch.dof, ch.unit, ch.rmsInBand, ch.peak, ch.status, ch.message])),
    ),
  );
  if (raw) {
    put(
      'hits/index.csv',
      toCsv(
        ['file', 'hit_id', 'entry_id', 'sequence', 'verdict', 'reasons', 'settings_version', 'sample_rate_hz', 'samples', 'recorded_at', 'recorded_by', 'sha256', 'channels'],
        raw.map((h) => [h.file, h.hitId, h.entryId, h.sequence, h.verdict, h.reasons.map((r) => r.code).join(' '), h.settingsVersion, h.sampleRateHz, h.samples, h.recordedAt, h.recordedBy, h.sha256, JSON.stringify(h.channels)]),
      ),
    );
  }
  return files;
}

/** A raw hit as CSV: time_s, then one column per channel in storage order, float32 values written exactly. */
function hitCsv(h: RawHit, values: ArrayLike<number>[]): Uint8Array {
  const header = ['time_s', ...h.channels.map((c) => `ch${c.channel}_${c.role === 'force' ? 'force_N' : 'response_ms2'}_${fileSafe(c.dof)}`)];
  const lines: string[] = [header.join(',')];
  for (let i = 0; i < h.samples; i++) lines.push([i / h.sampleRateHz, ...values.map((ch) => f32Text(ch[i]!))].join(','));
  return strToU8(lines.join('\r\n') + '\r\n');
}

/**
 * Writes the hand-over zip to `out` as it is built: the small files first, then (with `raw`) each
 * hit's CSV, read from the database one hit at a time and written before the next is read, waiting
 * whenever `out` asks to drain. Memory stays near one hit's CSV whatever the campaign's size.
 */
export async function streamBundleZip(db: Db, d: HandoverData, raw: boolean, out: Writable): Promise<void> {
  const index = raw ? await rawHitIndex(db, d) : null;
  let failed: Error | null = null;
  const zip = new Zip((err, chunk, final) => {
    if (err) {
      failed = err;
      return;
    }
    out.write(chunk);
    if (final) out.end();
  });
  const add = async (name: string, bytes: Uint8Array, level: 1 | 6) => {
    if (failed) throw failed;
    // A client that went away ends the export: nothing more is read from the database.
    if (out.destroyed) throw new Error('the download was closed by the client');
    const file = new ZipDeflate(name, { level });
    zip.add(file);
    file.push(bytes, true);
    if (out.writableNeedDrain) await settled(out, 'drain');
  };
  for (const [name, bytes] of bundleFiles(d, index)) await add(name, bytes, 6);
  // Raw noise compresses poorly; store it fast.
  for (const h of index ?? []) await add(h.file, hitCsv(h, await hitValues(db, h)), 1);
  zip.end();
  if (failed) throw failed;
  if (!out.writableFinished) await settled(out, 'finish');
}

/** Waits for `event` on `out`, or ends with an error when the stream closes first (a client that went away). */
function settled(out: Writable, event: 'drain' | 'finish'): Promise<void> {
  return new Promise((resolve, reject) => {
    const done = () => {
      out.off('close', closed);
      resolve();
    };
    const closed = () => {
      out.off(event, done);
      reject(new Error('the download was closed by the client'));
    };
    out.once(event, done);
    out.once('close', closed);
  });
}
