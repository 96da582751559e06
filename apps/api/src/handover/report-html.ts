// The hand-over report as one self-contained, printable HTML page (A4, print CSS, inline SVG, no
// external assets). The same page is served to members, through a shared link, and printed to PDF.
import { defaultAcquisitionSettings, settingsChangeInWords, type AcquisitionSettings } from '@resonote/contracts';
import { recordSamples } from '../hits/current-settings.ts';
import { exponentialWindowOf } from '../hits/settings-to-dsp.ts';
import { diffSettings } from '../routes/settings.ts';
import type { HandoverData } from './collect.ts';
import { notesSectionHtml, NOTES_CSS } from './notes.ts';
import { esc, frequencyPairSvg, frfThumbSvg, geometrySvg, modeShapeSvg } from './svg.ts';

export const DB_REFERENCE = 'dB re 1 (m/s²)/N';

const PURPOSE: Record<string, string> = { 'calibrated-frf': 'Calibrated FRF measurement', 'quick-survey': 'Quick survey (uncalibrated bump test)' };
const TEST_TYPE: Record<string, string> = { 'roving-hammer': 'Roving hammer (accelerometer(s) fixed at the reference DOF, the hammer moves)', 'roving-response': 'Roving response (hammer fixed at the reference DOF, the accelerometer moves)' };
const STATUS: Record<string, string> = { planning: 'Planning', testing: 'Testing', analysis: 'Analysis', 'handed-over': 'Handed over' };
export const REASON: Record<string, string> = {
  'double-hit': 'double hit',
  overload: 'force overload (clipping)',
  'response-overload': 'response overload (clipping)',
  weak: 'weak hit (too soft)',
  'roll-off': 'force spectrum roll-off across the band',
  'not-decayed': 'response not decayed by the end of the record',
};
const CAL_STATE: Record<string, string> = { ok: '✓ valid', 'due-soon': '! due soon', overdue: '✗ overdue', none: '✗ no record' };

/** A number in monospace with its unit. */
const n = (v: number | null | undefined, digits = 3, unit = '') =>
  v === null || v === undefined || !Number.isFinite(v) ? '<span class="n">–</span>' : `<span class="n">${esc(formatNumber(v, digits))}${unit ? `&#8239;${esc(unit)}` : ''}</span>`;

/** Background-noise checks: when, by whom, and each channel's floor in the band with the reading in words. */
function noiseSection(d: HandoverData): string {
  if (!d.noise.length) return '<h3>Background noise</h3><p class="muted">No background-noise check was recorded.</p>';
  const rows = d.noise
    .flatMap((c) =>
      c.channels.map(
        (ch, i) =>
          `<tr>${i === 0 ? `<td rowspan="${c.channels.length}">${esc(c.at.toISOString().slice(0, 16).replace('T', ' '))} UTC<br><span class="small">${esc(c.by ?? '–')} · ${c.durationS.toFixed(1)} s · ${esc(c.source.startsWith('simulated') ? 'simulated rig' : 'upload')}</span></td>` : ''}<td class="n">ch${ch.channel} ${esc(ch.role === 'force' ? 'hammer' : ch.dof)}</td><td class="n r">${ch.rmsInBand.toPrecision(3)} ${esc(ch.unit)}</td><td class="n r">${ch.peak.toPrecision(3)} ${esc(ch.unit)}</td><td>${ch.status === 'ok' ? '✓' : '▲'} ${esc(ch.message)}</td></tr>`,
      ),
    )
    .join('');
  return `<h3>Background noise</h3><p class="small">Quiet recordings with nobody touching the structure, read as a Welch PSD (Hann, 50 % overlap, mean removed): RMS within the band of interest, peak, and tones standing 10 dB or more above the local floor (Resonote's rule of thumb).</p><table class="grid"><thead><tr><th>Recorded</th><th>Channel</th><th>RMS in band</th><th>Peak</th><th>Reading</th></tr></thead><tbody>${rows}</tbody></table>`;
}

export function formatNumber(v: number, digits = 3): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-3) return v.toExponential(digits - 1);
  return Number(v.toPrecision(Math.max(digits, Math.ceil(Math.log10(a + 1))))).toString();
}

const dateTime = (d: Date | string | null) => (d ? new Date(d).toISOString().replace('T', ' ').slice(0, 16) + ' UTC' : '–');
const mono = (s: unknown) => `<span class="n">${esc(s)}</span>`;

function settingsRows(s: AcquisitionSettings): string {
  const exp = exponentialWindowOf(s);
  const samples = recordSamples(s);
  const rows: [string, string][] = [
    ['Sample rate', n(s.sampleRateHz, 6, 'Hz')],
    ['Record length', `${n(s.recordLengthS, 4, 's')} (${mono(samples)} samples per channel, Δf = ${n(s.sampleRateHz / samples, 4, 'Hz')})`],
    ['Pre-trigger', n(s.preTriggerS * 1000, 4, 'ms')],
    ['Trigger level', n(s.triggerLevelN, 4, 'N')],
    ['Force window', `unity for ${n(s.forceWindow.lengthS * 1000, 4, 'ms')} from the record start, then a half-cosine taper of ${n(s.forceWindow.taperS * 1000, 4, 'ms')}`],
    [
      'Exponential window',
      exp
        ? `on force and response from the trigger: τ = ${n(exp.tauS, 4, 's')}, ${n(exp.endLevelPercent, 3, '%')} at the end of the record; the damping it adds is removed from the modal results`
        : 'none',
    ],
    ['Hits to average', mono(s.hitsToAverage)],
    ['Band of interest', `${n(s.bandHz.low, 5, 'Hz')} – ${n(s.bandHz.high, 5, 'Hz')}`],
    ['Estimator', `${esc(s.estimator)} (H1 = G_fx/G_ff; H2 = G_xx/G_xf)`],
    ['Double-hit limit', `second peak above ${n(s.doubleHitRatio * 100, 3, '%')} of the first`],
    ['Overload limit', `${n(s.overloadPercent, 3, '%')} of the input range (force ${n(s.forceRangeN, 5, 'N')}, response ${n(s.responseRangeMs2, 5, 'm/s²')})`],
    ['Weakest hit', n(s.minPeakN, 4, 'N')],
    ['Force roll-off limit', n(s.rollOffDb, 3, 'dB')],
    ['Coherence for “done”', `mean γ² over the band ≥ ${n(s.coherenceThreshold, 3)}`],
  ];
  return rows.map(([k, v]) => `<tr><th>${esc(k)}</th><td>${v}</td></tr>`).join('');
}

function shade(v: number): string {
  const g = Math.round(255 - 175 * Math.max(0, Math.min(1, v)));
  return `background:rgb(${g},${g},${g});color:${v > 0.55 ? '#fff' : '#111'}`;
}

export interface ReportOptions {
  /** Shown on a shared (read-only) copy. */
  sharedUntil?: Date;
  publicUrl: string;
}

/** Test against the FE model: pairs by MAC, frequency differences, MAC matrix, cross-orthogonality, frequency plot. */
function correlationSection(d: HandoverData): string {
  const k = d.correlation;
  const title = '<h2>Correlation with the finite-element model</h2>';
  if (!k) return `<section>${title}<p class="muted">The campaign holds no finite-element model, so there is no correlation.</p></section>`;
  const about = `<p>Model <b>${esc(k.model.name)}</b>, version ${esc(k.model.versionLabel)} (uploaded ${esc(k.model.uploadedAt.toISOString().slice(0, 10))}; ${k.model.nodeCount} nodes, ${k.model.modeCount} modes; shapes ${k.model.normalisation === 'mass' ? 'mass-normalised' : 'not mass-normalised'}).</p>`;
  const r = k.result;
  if (!r.ok) return `<section>${title}${about}<p class="muted">${esc(r.why)}</p></section>`;
  const rows = r.pairs
    .map((p) => `<tr><td class="n r">${p.testMode}</td><td class="n r">${p.testHz.toFixed(2)}</td><td class="n r">${p.modelMode}</td><td class="n r">${p.modelHz.toFixed(2)}</td><td class="n r">${p.frequencyDifferencePercent === null ? '—' : `${p.frequencyDifferencePercent >= 0 ? '+' : ''}${p.frequencyDifferencePercent.toFixed(2)}`}</td><td class="n r">${p.mac.toFixed(3)}</td></tr>`)
    .join('');
  const head = r.modelModes.map((m) => `<th class="n">${m.number}</th>`).join('');
  const macRows = r.mac.map((row, i) => `<tr><th class="n">${r.testModes[i]!.mode}</th>${row.map((v) => `<td class="n mac" style="${shade(v)}">${v.toFixed(2)}</td>`).join('')}</tr>`).join('');
  const xo = r.crossOrthogonality;
  const xoHtml = xo.ok
    ? `<h3>Cross-orthogonality (${esc(xo.method)})</h3><p class="small">${esc(xo.words)}</p><table class="grid macm"><thead><tr><th></th>${r.pairs.map((p) => `<th class="n">FE ${p.modelMode}</th>`).join('')}</tr></thead><tbody>${xo.matrix.map((row, i) => `<tr><th class="n">test ${r.pairs[i]!.testMode}</th>${row.map((v) => `<td class="n mac" style="${shade(Math.abs(v))}">${v.toFixed(2)}</td>`).join('')}</tr>`).join('')}</tbody></table>`
    : `<p class="small">Cross-orthogonality: ${esc(xo.why)}</p>`;
  const unpaired = [
    r.unpairedTest.length ? `test modes without a partner: ${r.unpairedTest.join(', ')}` : '',
    r.unpairedModel.length ? `model modes without a partner: ${r.unpairedModel.join(', ')}` : '',
  ].filter(Boolean);
  return `<section>${title}${about}<p>${esc(r.words)}</p>
<table class="grid keep" style="width:auto"><thead><tr><th>Test mode</th><th>f test (Hz)</th><th>Model mode</th><th>f model (Hz)</th><th>Δf (%)</th><th>MAC (–)</th></tr></thead><tbody>${rows}</tbody></table>
<p class="small">Δf = (f_test − f_model)/f_model × 100 %. ${unpaired.length ? esc(unpaired.join('; ')) + '.' : ''} ${esc(r.method)} Test modes from ${esc(r.source)}.</p>
<div class="two"><div class="keep"><h3>MAC, test (rows) against model (columns)</h3><table class="grid macm"><thead><tr><th></th>${head}</tr></thead><tbody>${macRows}</tbody></table></div>
<div class="keep"><h3>Test against model frequencies</h3>${frequencyPairSvg(r.pairs.map((p) => ({ testHz: p.testHz, modelHz: p.modelHz, label: `test ${p.testMode} / model ${p.modelMode}` })))}<p class="small">Dashed: f_test = f_model; a dot below it is a test mode lower than the model's.</p></div></div>
${xoHtml}</section>`;
}

export function renderReport(d: HandoverData, options: ReportOptions): string {
  const c = d.campaign;
  const s = d.settings.settings;
  const refPoints = new Set(c.referenceDofs.map((x) => x.split(':')[0]!));
  const statusCounts: Record<string, number> = { planned: 0, 'in-progress': 0, done: 0, flagged: 0, skipped: 0 };
  for (const e of d.schedule) statusCounts[e.status] = (statusCounts[e.status] ?? 0) + 1;
  const sec: string[] = [];

  // 1. Summary
  sec.push(`<section><h2>1. Campaign</h2><table class="kv">
<tr><th>Campaign</th><td>${esc(c.name)}</td></tr>
<tr><th>Purpose</th><td>${esc(PURPOSE[c.purpose] ?? c.purpose)}</td></tr>
<tr><th>Structure</th><td>${esc(c.structure || '–')}</td></tr>
<tr><th>Client</th><td>${esc(c.client || '–')}</td></tr>
<tr><th>Test type</th><td>${esc(TEST_TYPE[c.testType] ?? c.testType)}</td></tr>
<tr><th>Reference DOF(s)</th><td>${c.referenceDofs.length ? c.referenceDofs.map(mono).join(', ') : '–'}</td></tr>
<tr><th>Status</th><td>${esc(STATUS[c.status] ?? c.status)}</td></tr>
<tr><th>Lead(s)</th><td>${esc(d.leads.join(', ') || '–')}</td></tr>
<tr><th>Test period</th><td>${d.hits.firstAt ? `${esc(dateTime(d.hits.firstAt))} – ${esc(dateTime(d.hits.lastAt))}` : 'no hits recorded'}</td></tr>
<tr><th>Schedule</th><td>${mono(d.schedule.length)} DOF pairs: ${Object.entries(statusCounts).map(([k, v]) => `${mono(v)} ${esc(k)}`).join(', ')}</td></tr>
<tr><th>Support and notes</th><td class="notes">${esc(c.notes || '–')}</td></tr>
</table></section>`);

  // 2. Conventions
  sec.push(`<section><h2>2. Conventions and units</h2><ul class="conv">
<li><b>FRF</b> H_ij = response at DOF i ÷ force at DOF j, written H(response, excitation). Results are <b>accelerance</b> in (m/s²)/N; magnitudes in ${DB_REFERENCE} (20·log10 of the amplitude ratio).</li>
<li><b>DOF label</b> <span class="n">point:±axis</span>, e.g. <span class="n">B05:+Z</span> — the point's label and a signed direction in a right-handed global frame; coordinates in mm.</li>
<li><b>Signs</b> time dependence e<sup>+jωt</sup>; spectra X(f) = Δt·Σ x<sub>n</sub> e<sup>−j2πkn/N</sup>; the hammer force is positive in compression (along the strike direction); a sensor mounted against its DOF direction is recorded with sign −1 and corrected before averaging.</li>
<li><b>Estimators</b> H1 = G_fx/G_ff, H2 = G_xx/G_xf, ordinary coherence γ² = |G_fx|²/(G_ff·G_xx) on 0–1, with G_fx = mean(conj(F)·X) over the accepted hits (one triggered record per average, no overlap).</li>
<li><b>Damping</b> ζ in % of critical, corrected for the exponential window (σ_true = σ_est − 1/τ). Frequencies in Hz, forces in N, sensitivities in mV/N and mV/(m/s²).</li>
</ul></section>`);

  // 3. Geometry
  sec.push(`<section class="keep"><h2>3. Geometry</h2>
<figure>${geometrySvg(d.points, d.lines, refPoints)}<figcaption>${mono(d.points.length)} points, ${mono(d.lines.length)} lines; orthographic view, coordinates in mm. Squares: reference point(s)${c.referenceDofs.length ? ` (${c.referenceDofs.map(esc).join(', ')})` : ''}; dots: other points. Coordinates are listed in Appendix C.</figcaption></figure></section>`);

  // 4. Kit
  const kitRows = d.kit
    .map(
      (k) => `<tr><td>${esc(k.kind)}</td><td>${esc(k.model)}</td><td class="n">${esc(k.serial)}</td><td>${n(k.sensitivity, 5, k.sensitivityUnit)}${k.sensitivityUnit !== k.sensitivityBaseUnit ? ` = ${n(k.sensitivityBase, 5, k.sensitivityBaseUnit)}` : ''}</td>
<td>${k.latest ? `${mono(k.latest.calibratedOn)}, due ${mono(k.latest.dueOn)}<br><span class="small">${esc(k.latest.certificateRef)} · ${esc(k.latest.performedBy)}</span>` : '–'}</td>
<td>${esc(CAL_STATE[k.stateAtTest.state])} <span class="small">on ${mono(k.stateAtTest.on)}</span></td><td>${esc(CAL_STATE[k.stateToday.state])}</td></tr>`,
    )
    .join('');
  const chRows = d.channels.map((ch) => `<tr><td class="n">${ch.channel}</td><td>${esc(ch.kind)}</td><td>${esc(ch.model)} <span class="n">SN ${esc(ch.serial)}</span></td><td class="n">${esc(ch.axis ?? '–')}</td><td class="n">${esc(ch.dof ?? (ch.kind === 'hammer' ? 'excitation DOF of each entry' : 'response DOF of each entry'))}</td><td class="n">${ch.sign === -1 ? '−1' : '+1'}</td></tr>`).join('');
  sec.push(`<section><h2>4. Kit and calibration at test time</h2>
${d.kit.length ? `<table class="grid"><thead><tr><th>Kind</th><th>Model</th><th>Serial</th><th>Sensitivity</th><th>Latest calibration</th><th>State at test time</th><th>State today</th></tr></thead><tbody>${kitRows}</tbody></table>` : '<p class="muted">No kit registered.</p>'}
<p class="small">State at test time: the newest calibration made on or before the last test day, against its due date. Each hit stores the sensitivity and calibration it was recorded with (see the raw data export).</p>
${d.channels.length ? `<h3>Channel map</h3><table class="grid"><thead><tr><th>Ch.</th><th>Kind</th><th>Sensor</th><th>Axis</th><th>DOF</th><th>Sign</th></tr></thead><tbody>${chRows}</tbody></table>` : ''}</section>`);

  // 5. Settings
  // What each version changed, in words with units ("force window length 20 → 40 ms"), against the one before (the defaults for the first).
  const changesOf = (i: number) => diffSettings(i === 0 ? defaultAcquisitionSettings : d.settings.history[i - 1]!.settings, d.settings.history[i]!.settings).map(settingsChangeInWords);
  const histRows = d.settings.history
    .map((h, i) => `<tr><td class="n">${h.version}</td><td class="n">${esc(dateTime(h.createdAt))}</td><td>${esc(h.createdBy ?? '–')}</td><td>${esc(h.reason || '–')}</td><td>${esc(changesOf(i).join('; ') || '–')}</td></tr>`)
    .join('');
  sec.push(`<section><h2>5. Acquisition settings</h2>
<p>Current version ${mono(d.settings.version)} of ${mono(d.settings.history.length)} version${d.settings.history.length === 1 ? '' : 's'}${d.settings.version === 0 ? ' (defaults; never changed)' : ''}. Every FRF below was computed with this version.</p>
<table class="kv">${settingsRows(s)}</table>
${histRows ? `<h3>Version history</h3><table class="grid"><thead><tr><th>Version</th><th>Saved</th><th>By</th><th>Reason</th><th>Changes</th></tr></thead><tbody>${histRows}</tbody></table>` : ''}</section>`);

  // 6. Hits
  const reasonRows = d.hits.byReason.map((r) => `<tr><td>${esc(REASON[r.code] ?? r.code)}</td><td class="n r">${r.n}</td></tr>`).join('');
  const engRows = d.hits.byEngineer.map((e) => `<tr><td>${esc(e.name)}</td><td class="n r">${e.hits}</td><td class="n r">${e.accepted}</td><td class="n r">${e.rejected}</td><td class="n r">${e.hits ? ((100 * e.rejected) / e.hits).toFixed(1) : '–'}&#8239;%</td></tr>`).join('');
  sec.push(`<section><h2>6. Hits</h2>
<p>${mono(d.hits.total)} hits recorded: ${mono(d.hits.accepted)} accepted (✓), ${mono(d.hits.rejected)} rejected (✗), ${mono(d.hits.overridden)} with the automatic verdict overridden by hand.${d.hits.setAside ? ` ${mono(d.hits.setAside)} more hits were set aside by a redo of their DOF and are not counted here.` : ''} Rejected and set-aside hits are kept with their reasons; nothing is deleted.</p>
<div class="two keep"><div><h3>Rejected hits by reason</h3>${reasonRows ? `<table class="grid"><thead><tr><th>Reason</th><th>Hits</th></tr></thead><tbody>${reasonRows}</tbody></table><p class="small">A hit can have more than one reason.</p>` : '<p class="muted">None rejected.</p>'}</div>
<div><h3>By engineer</h3>${engRows ? `<table class="grid"><thead><tr><th>Engineer</th><th>Hits</th><th>✓</th><th>✗</th><th>Rejected</th></tr></thead><tbody>${engRows}</tbody></table>` : '<p class="muted">No hits.</p>'}</div></div>
${noiseSection(d)}
${notesSectionHtml(d.notes)}</section>`);

  // 7. FRFs
  const frfByEntry = new Map(d.frfs.map((x) => [x.entry.id, x]));
  const schedRows = d.schedule
    .map((e) => {
      const r = frfByEntry.get(e.id);
      const coh = r ? r.result.channels[r.main]?.meanCoherence : undefined;
      return `<tr><td class="n r">${e.position}</td><td class="n">${esc(e.responseDof)}</td><td class="n">${esc(e.excitationDof)}${e.drivingPoint ? ' (driving point)' : ''}</td><td>${esc(e.status)}</td><td class="n r">${e.acceptedHits}</td><td class="n r">${e.rejectedHits}</td><td class="n r">${coh === undefined ? '–' : coh.toFixed(3)}</td></tr>`;
    })
    .join('');
  const thumbs = d.frfs
    .flatMap((x) =>
      x.result.channels.map((ch, i) => {
        const title = `H(${ch.dof}, ${x.result.excitationDof}) · ${x.result.averages} avg`;
        return `<figure class="thumb">${frfThumbSvg(title, x.result.frf.f, x.result.frf.h1[i]!.re, x.result.frf.h1[i]!.im, x.result.frf.coherence[i]!, s.bandHz)}</figure>`;
      }),
    )
    .join('');
  sec.push(`<section><h2>7. FRFs and coherence</h2>
<table class="grid"><thead><tr><th>#</th><th>Response</th><th>Excitation</th><th>Status</th><th>✓ hits</th><th>✗ hits</th><th>Mean γ² in band</th></tr></thead><tbody>${schedRows || '<tr><td colspan="7" class="muted">No schedule.</td></tr>'}</tbody></table>
${thumbs ? `<p class="small">Each thumbnail: |H1| accelerance in ${DB_REFERENCE} (top) and ordinary coherence γ² on 0–1 (bottom) over the band ${n(s.bandHz.low, 5, 'Hz')} – ${n(s.bandHz.high, 5, 'Hz')}, linear frequency axis in Hz. Traceability in Appendix A.</p><div class="thumbs">${thumbs}</div>` : '<p class="muted">No FRF with accepted hits yet.</p>'}</section>`);

  // 8. Checks
  if (d.checks) {
    const peaks = (p: { fHz: number; dbDifference: number; phaseDifferenceDeg: number; peakShiftHz: number }[]) =>
      p.map((x) => `${n(x.fHz, 5, 'Hz')}: ${n(x.dbDifference, 2, 'dB')}, ${n(x.phaseDifferenceDeg, 3, '°')}, shift ${n(x.peakShiftHz, 3, 'Hz')}`).join('<br>') || '–';
    const rec = d.checks.reciprocity.map((r) => `<tr><td class="n">H(${esc(r.a.response)}, ${esc(r.a.excitation)}) vs H(${esc(r.b.response)}, ${esc(r.b.excitation)})</td><td class="n r">${r.frac.toFixed(4)}</td><td class="small">${peaks(r.peaks)}</td></tr>`).join('');
    const lin = d.checks.linearity.map((r) => `<tr><td class="n">H(${esc(r.entry.response)}, ${esc(r.entry.excitation)})</td><td>${n(r.lowForceN, 3, 'N')} / ${n(r.highForceN, 3, 'N')} (×${r.forceRatio.toFixed(2)}, ${r.hitsPerLevel} hits each)</td><td class="n r">${r.frac.toFixed(4)}</td><td class="small">${peaks(r.peaks)}</td></tr>`).join('');
    sec.push(`<section><h2>8. Measurement checks</h2>
<h3>Reciprocity (H_ij against H_ji)</h3>${rec ? `<table class="grid"><thead><tr><th>Pair</th><th>FRAC</th><th>At the peaks: dB difference, phase difference, peak shift</th></tr></thead><tbody>${rec}</tbody></table>` : '<p class="muted">No reciprocal pair was measured (the schedule has no H_ij together with H_ji).</p>'}
<h3>Linearity (the same DOF pair at two force levels)</h3>${lin ? `<table class="grid"><thead><tr><th>FRF</th><th>Median peak force low / high</th><th>FRAC</th><th>At the peaks (high against low)</th></tr></thead><tbody>${lin}</tbody></table>` : '<p class="muted">No entry has at least 4 accepted hits whose peak forces differ by a factor of 1.5 or more between the softer and the harder half.</p>'}
<p class="small">${esc(d.checks.note)}</p></section>`);
  }

  // 9. Modes
  const m = d.modes;
  if (m) {
    const fitNo = new Map(m.fits.map((f, i) => [f.fitId, i + 1]));
    const modeRows = m.table
      .map(
        (r) =>
          `<tr${r.duplicate ? ' class="dup"' : ''}><td class="n r">${r.mode}</td><td class="n r">${r.fHz.toFixed(2)}</td><td class="n r">${r.zetaPercent.toFixed(3)}</td><td class="n r">${r.estimated.zetaPercent.toFixed(3)}</td><td class="n r">${r.mpc.toFixed(3)}</td><td class="n">${r.source.fitId ? `fit ${fitNo.get(r.source.fitId) ?? '?'}` : 'fit removed'} · ${esc(r.source.bandHz[0])}–${esc(r.source.bandHz[1])} Hz · order ${r.source.order} · ref. ${esc(r.source.references.join(', '))}</td><td>${r.massShape ? 'yes' : 'no'}</td><td>${r.duplicate ? `same as mode ${r.duplicate.of ?? '?'}: ${esc(r.duplicate.note)}` : ''}</td></tr>`,
      )
      .join('');
    const head = m.table.map((r) => `<th class="n">${r.mode}</th>`).join('');
    const macRows = m.mac.map((row, i) => `<tr><th class="n">${i + 1}</th>${row.map((v) => `<td class="n mac" style="${shade(v)}">${v.toFixed(2)}</td>`).join('')}</tr>`).join('');
    const shapes = m.table.map((r) => `<figure class="shape">${modeShapeSvg(`Mode ${r.mode} · ${r.fHz.toFixed(2)} Hz · ζ ${r.zetaPercent.toFixed(2)} %`, d.points, d.lines, r.shape)}</figure>`).join('');
    const fitList = m.fits
      .map((f, i) => `<li>Fit ${i + 1} (<span class="n">${esc(f.fitId)}</span>): ${n(f.bandHz[0], 5, 'Hz')} – ${n(f.bandHz[1], 5, 'Hz')}, ${mono(f.frfCount)} FRFs, settings version ${mono(f.settingsVersion)}; shapes computed by ${esc(f.chosenBy)} on ${esc(dateTime(f.chosenAt))}. Window correction: ${esc(f.correction)}.</li>`)
      .join('');
    const massNotes = [...new Set(m.table.filter((r) => !r.massShape).map((r) => r.massNote).filter(Boolean))];
    const withMass = m.table.filter((r) => r.massShape);
    const massTable = withMass.length
      ? `<h3>Mass-normalised shapes (unit modal mass, 1/√kg)</h3><p class="small">Scaled from the driving-point residue (Ewins 2000); each shape rotated so the driving point is real and positive, real part given.</p><table class="grid keep" style="width:auto"><thead><tr><th>Mode</th>${withMass[0]!.massShape!.map((s) => `<th class="n">${esc(s.dof)}</th>`).join('')}</tr></thead><tbody>${withMass.map((r) => `<tr><td class="n r">${r.mode}</td>${r.massShape!.map((s) => `<td class="n r">${s.real.toPrecision(4)}</td>`).join('')}</tr>`).join('')}</tbody></table>`
      : '';
    sec.push(`<section><h2>9. Modes</h2>
<p>The campaign's mode table: ${mono(m.table.length)} mode${m.table.length === 1 ? '' : 's'} taken from ${mono(m.fits.length)} fit${m.fits.length === 1 ? '' : 's'}:</p><ul class="small">${fitList}</ul>
<table class="grid keep"><thead><tr><th>Mode</th><th>f (Hz)</th><th>ζ (% of critical)</th><th>ζ before window correction (%)</th><th>MPC (–)</th><th>From</th><th>Mass-normalised</th><th>Found twice</th></tr></thead><tbody>${modeRows}</tbody></table>
<p class="small">${esc(m.duplicateRule)} ${esc(m.axisConvention)}</p>
${massNotes.length ? `<p class="small">Not mass-normalised: ${massNotes.map(esc).join(' ')}</p>` : ''}
<div class="two"><div class="keep"><h3>MAC matrix of the table's shapes</h3><table class="grid macm"><thead><tr><th></th>${head}</tr></thead><tbody>${macRows}</tbody></table><p class="small">Over the DOFs each pair of shapes shares. Shade and number both give the MAC value (0 white, 1 dark).</p></div></div>
${massTable}
<h3>Mode shapes</h3><p class="small">Real part of each shape (the shape rotated to its best real fit), normalised to the largest displacement and drawn on the geometry; the scale is arbitrary.</p><div class="shapes">${shapes}</div></section>`);
  } else {
    sec.push(`<section><h2>9. Modes</h2><p class="muted">The campaign\'s mode table is empty: no modes have been added from a fit yet.</p></section>`);
  }

  sec.push(correlationSection(d));

  // 10. Cautions
  sec.push(`<section class="keep caution"><h2>10. Safety and interpretation</h2><ul>
<li>Secure the structure and the hammer before testing; wear eye protection (tips and chips can fly).</li>
<li>Keep clear of rotating or energised machinery; isolate and lock out before touching it.</li>
<li>Do not test structures in service without the owner's procedures and permission.</li>
<li>The results describe the structure as supported and measured in this campaign (supports, mass loading by the sensors, temperature). Structural judgements drawn from them — fitness for purpose, remaining life, compliance — belong to licensed practice under local codes.</li>
</ul></section>`);

  // Appendix
  const appA = d.frfs
    .map(
      (x) => `<div class="trace-item"><b class="n">H(${x.result.channels.map((ch) => esc(ch.dof)).join(' / ')}, ${esc(x.result.excitationDof)})</b> · schedule entry <span class="n id">${esc(x.entry.id)}</span> · ${mono(x.result.averages)} averages · settings version ${mono(x.result.settingsVersion)}<br>
input hash <span class="n">${esc(x.result.inputHash)}</span><br>accepted hits ${x.result.hitIds.map((h) => `<span class="n id">${esc(h)}</span>`).join(' ')}</div>`,
    )
    .join('');
  const frfByHash = new Map(d.frfs.map((x) => [x.result.inputHash, `H(${x.result.channels.map((ch) => ch.dof).join(' / ')}, ${x.result.excitationDof})`]));
  const appB = m
    ? `${m.fits
        .map(
          (f, i) => `<p class="small">Fit ${i + 1}: <span class="n">${esc(f.fitId)}</span>, fit input hash <span class="n">${esc(f.inputHash)}</span> (covers the settings version ${esc(f.settingsVersion)}, the FRF input hashes below, the band ${esc(f.bandHz[0])}–${esc(f.bandHz[1])} Hz and the fit options).</p>
<p class="small">FRFs the fit used (input hash → FRF):</p><div class="hash-list">${f.resultHashes.map((h) => `<div><span class="n">${esc(h)}</span> ${frfByHash.has(h) ? `<span class="n">${esc(frfByHash.get(h))}</span>` : '<i>(no longer the current result of its entry)</i>'}</div>`).join('')}</div>`,
        )
        .join('')}
<table class="grid keep" style="width:auto"><thead><tr><th>Mode</th><th>f (Hz)</th><th>ζ (%)</th><th>Fit</th><th>Chosen pole in the stabilization diagram</th><th>Fit input hash</th></tr></thead><tbody>${m.table
        .map((r) => `<tr><td class="n r">${r.mode}</td><td class="n r">${r.fHz.toFixed(3)}</td><td class="n r">${r.zetaPercent.toFixed(3)}</td><td class="n">${r.source.fitId ? esc(r.source.fitId) : '–'}</td><td class="n">model order ${r.pole.order}, pole ${r.pole.index}</td><td class="n id">${esc(r.source.inputHash.slice(0, 16))}…</td></tr>`)
        .join('')}</tbody></table>`
    : '';
  const appC = d.points.map((p) => `<tr><td class="n">${esc(p.label)}</td><td class="n r">${p.x}</td><td class="n r">${p.y}</td><td class="n r">${p.z}</td><td class="n">${esc(p.directions.join(' '))}${p.retired ? ' (retired)' : ''}</td></tr>`).join('');
  sec.push(`<section class="appendix"><h2>Appendix A — where each FRF comes from</h2>
<p class="small">Each FRF is the average of the accepted hits listed (ids as stored; raw samples never change), processed with the settings version given. The input hash is SHA-256 over the settings version and the accepted hit ids with their verdict versions; the same hash means the same inputs.</p>
${appA ? `<div class="trace-list">${appA}</div>` : '<p class="muted">No FRFs.</p>'}
<h2>Appendix B — where each mode comes from</h2>
${m ? appB : '<p class="muted">No modes.</p>'}
<h2>Appendix C — point coordinates (mm)</h2>
${appC ? `<table class="grid pts"><thead><tr><th>Point</th><th>x (mm)</th><th>y (mm)</th><th>z (mm)</th><th>Directions</th></tr></thead><tbody>${appC}</tbody></table>` : '<p class="muted">No points.</p>'}
</section>`);

  const banner = options.sharedUntil
    ? `<p class="shared">Shared read-only copy of the hand-over report. This link is valid until ${esc(dateTime(options.sharedUntil))}.</p>`
    : '';
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>Hand-over report — ${esc(c.name)}</title>
<style>${CSS}</style></head>
<body><main>
${banner}
<header><div class="brand">Resonote · Hand-over report</div><h1>${esc(c.name)}</h1>
<p class="meta">${esc(c.structure)}${c.client ? ` · for ${esc(c.client)}` : ''} · generated ${esc(dateTime(d.generatedAt))} · settings version ${mono(d.settings.version)} · campaign id <span class="n">${esc(c.id)}</span></p></header>
${sec.join('\n')}
<footer class="small">Generated by Resonote at ${esc(options.publicUrl)} on ${esc(dateTime(d.generatedAt))}. Every number is traceable through the appendix to the stored hits and settings.</footer>
</main></body></html>`;
}

const CSS = `
@page { size: A4; margin: 14mm 13mm 16mm 13mm; }
* { box-sizing: border-box; }
html { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
body { margin: 0; font: 9.5pt/1.4 system-ui, -apple-system, "Segoe UI", "DejaVu Sans", Helvetica, Arial, sans-serif; color: #1b1f1e; background: #fff; }
main { max-width: 184mm; margin: 0 auto; padding: 8mm 0; }
@media print { main { padding: 0; max-width: none; } }
.n { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: 0.92em; }
.r { text-align: right; }
h1 { font-size: 17pt; margin: 2px 0 4px; }
h2 { font-size: 12pt; margin: 14px 0 6px; padding-bottom: 2px; border-bottom: 1px solid #c9cfcc; break-after: avoid; }
h3 { font-size: 10pt; margin: 10px 0 4px; break-after: avoid; }
.brand { font-size: 8.5pt; letter-spacing: 0.06em; text-transform: uppercase; color: #0b6e69; font-weight: 600; }
.meta { color: #4a5552; margin: 0 0 6px; font-size: 8.5pt; }
table { border-collapse: collapse; width: 100%; margin: 4px 0; }
th, td { text-align: left; vertical-align: top; padding: 2px 5px; }
table.kv th { width: 30%; font-weight: 600; color: #333; }
table.kv tr { border-bottom: 1px solid #eef0ef; }
table.grid { font-size: 8.5pt; }
table.grid thead th { background: #eef1f0; border-bottom: 1px solid #b9c0bd; font-weight: 600; }
table.grid td { border-bottom: 1px solid #eef0ef; }
tr { break-inside: avoid; }
.notes { white-space: pre-wrap; }
.small { font-size: 7.8pt; color: #4a5552; }
.muted { color: #6b7370; font-style: italic; }
.two { display: flex; gap: 6mm; }
.two > div { flex: 1; min-width: 0; }
figure { margin: 4px 0; break-inside: avoid; }
figcaption { font-size: 7.8pt; color: #4a5552; }
.thumbs { display: grid; grid-template-columns: 1fr 1fr; gap: 2mm 5mm; }
${NOTES_CSS}
.shapes { display: grid; grid-template-columns: 1fr 1fr 1fr; gap: 2mm 4mm; }
.thumb, .shape { border: 1px solid #e4e7e5; padding: 1mm; }
.keep { break-inside: avoid; }
table.macm { width: auto; }
table.macm td.mac { text-align: center; min-width: 11mm; }
.trace td.hash, .trace td.ids, span.hash { word-break: break-all; font-size: 7pt; }
.trace td.ids { font-size: 6.5pt; }
.trace-item { font-size: 7.6pt; line-height: 1.45; padding: 1.2mm 0; border-bottom: 1px solid #eef0ef; break-inside: avoid; }
.trace-item .n { font-size: 7pt; }
.hash-list { font-size: 7pt; columns: 1; }
.hash-list div { break-inside: avoid; }
.trace-item .id { white-space: nowrap; display: inline-block; margin-right: 1.5mm; }
.caution { border: 1.5px solid #8a3b0b; padding: 2mm 4mm; margin-top: 8px; }
.caution h2 { border: none; margin-top: 4px; }
.appendix { break-before: page; }
.shared { background: #fff6e0; border: 1px solid #d9b25a; padding: 2mm 4mm; font-size: 8.5pt; }
ul.conv li { margin-bottom: 2px; }
footer { margin-top: 10mm; border-top: 1px solid #c9cfcc; padding-top: 2mm; }
`;
