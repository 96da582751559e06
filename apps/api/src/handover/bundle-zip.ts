// The hand-over bundle as a zip of CSV/JSON files, streamed as it is built.
import type { Writable } from 'node:stream';
import { strToU8, Zip, ZipDeflate } from 'fflate';
import type { Db } from '@resonote/db/client';
import type { HandoverData } from './handover-data.ts';
import { bundleContent } from './bundle.ts';
import { toCsv } from './bundle-csv.ts';
import { hitCsv, hitValues, rawHitIndex, type RawHit } from './bundle-raw.ts';
import { readme } from './bundle-readme.ts';

/** Every file of the zip except the raw hits' own CSVs, in order: [name, bytes]. */
export function bundleFiles(d: HandoverData, raw: RawHit[] | null): [string, Uint8Array][] {
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
