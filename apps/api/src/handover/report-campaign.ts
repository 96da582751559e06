// Sections 1–6 of the hand-over report: the campaign, conventions, geometry, kit, settings and hits.
import { defaultAcquisitionSettings, settingsChangeInWords, type AcquisitionSettings } from '@resonote/contracts';
import { recordSamples } from '../hits/current-settings.ts';
import { exponentialWindowOf } from '../hits/settings-to-dsp.ts';
import { diffSettings } from '../routes/settings.ts';
import type { HandoverData } from './handover-data.ts';
import { notesSectionHtml } from './notes.ts';
import { CAL_STATE, DB_REFERENCE, PURPOSE, REASON, STATUS, TEST_TYPE, dateTime, mono, n } from './report-words.ts';
import { esc } from './svg-frame.ts';
import { geometrySvg } from './svg-geometry.ts';

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

/** 1. The campaign in a table: purpose, structure, test type, references, status, leads, test period, schedule. */
export function campaignSection(d: HandoverData): string[] {
  const c = d.campaign;
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
  return sec;
}

/** 2. Conventions and units. */
export function conventionsSection(d: HandoverData): string[] {
  const sec: string[] = [];
  // 2. Conventions
  sec.push(`<section><h2>2. Conventions and units</h2><ul class="conv">
<li><b>FRF</b> H_ij = response at DOF i ÷ force at DOF j, written H(response, excitation). Results are <b>accelerance</b> in (m/s²)/N; magnitudes in ${DB_REFERENCE} (20·log10 of the amplitude ratio).</li>
<li><b>DOF label</b> <span class="n">point:±axis</span>, e.g. <span class="n">B05:+Z</span> — the point's label and a signed direction in a right-handed global frame; coordinates in mm.</li>
<li><b>Signs</b> time dependence e<sup>+jωt</sup>; spectra X(f) = Δt·Σ x<sub>n</sub> e<sup>−j2πkn/N</sup>; the hammer force is positive in compression (along the strike direction); a sensor mounted against its DOF direction is recorded with sign −1 and corrected before averaging.</li>
<li><b>Estimators</b> H1 = G_fx/G_ff, H2 = G_xx/G_xf, ordinary coherence γ² = |G_fx|²/(G_ff·G_xx) on 0–1, with G_fx = mean(conj(F)·X) over the accepted hits (one triggered record per average, no overlap).</li>
<li><b>Damping</b> ζ in % of critical, corrected for the exponential window (σ_true = σ_est − 1/τ). Frequencies in Hz, forces in N, sensitivities in mV/N and mV/(m/s²).</li>
</ul></section>`);
  return sec;
}

/** 3. The geometry drawn in mm, reference points as squares. */
export function geometrySection(d: HandoverData): string[] {
  const c = d.campaign;
  const refPoints = new Set(c.referenceDofs.map((x) => x.split(':')[0]!));
  const sec: string[] = [];
  // 3. Geometry
  sec.push(`<section class="keep"><h2>3. Geometry</h2>
<figure>${geometrySvg(d.points, d.lines, refPoints)}<figcaption>${mono(d.points.length)} points, ${mono(d.lines.length)} lines; orthographic view, coordinates in mm. Squares: reference point(s)${c.referenceDofs.length ? ` (${c.referenceDofs.map(esc).join(', ')})` : ''}; dots: other points. Coordinates are listed in Appendix C.</figcaption></figure></section>`);
  return sec;
}

/** 4. Kit and calibration at test time, and the channel map. */
export function kitSection(d: HandoverData): string[] {
  const sec: string[] = [];
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
  return sec;
}

/** 5. The acquisition settings in force and their version history in words. */
export function settingsSection(d: HandoverData): string[] {
  const s = d.settings.settings;
  const sec: string[] = [];
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
  return sec;
}

/** 6. Hits: totals, rejections by reason, per engineer, background noise and notes per DOF. */
export function hitsSection(d: HandoverData): string[] {
  const sec: string[] = [];
  // 6. Hits
  const reasonRows = d.hits.byReason.map((r) => `<tr><td>${esc(REASON[r.code] ?? r.code)}</td><td class="n r">${r.n}</td></tr>`).join('');
  const engRows = d.hits.byEngineer.map((e) => `<tr><td>${esc(e.name)}</td><td class="n r">${e.hits}</td><td class="n r">${e.accepted}</td><td class="n r">${e.rejected}</td><td class="n r">${e.hits ? ((100 * e.rejected) / e.hits).toFixed(1) : '–'}&#8239;%</td></tr>`).join('');
  sec.push(`<section><h2>6. Hits</h2>
<p>${mono(d.hits.total)} hits recorded: ${mono(d.hits.accepted)} accepted (✓), ${mono(d.hits.rejected)} rejected (✗), ${mono(d.hits.overridden)} with the automatic verdict overridden by hand.${d.hits.setAside ? ` ${mono(d.hits.setAside)} more hits were set aside by a redo of their DOF and are not counted here.` : ''} Rejected and set-aside hits are kept with their reasons; nothing is deleted.</p>
<div class="two keep"><div><h3>Rejected hits by reason</h3>${reasonRows ? `<table class="grid"><thead><tr><th>Reason</th><th>Hits</th></tr></thead><tbody>${reasonRows}</tbody></table><p class="small">A hit can have more than one reason.</p>` : '<p class="muted">None rejected.</p>'}</div>
<div><h3>By engineer</h3>${engRows ? `<table class="grid"><thead><tr><th>Engineer</th><th>Hits</th><th>✓</th><th>✗</th><th>Rejected</th></tr></thead><tbody>${engRows}</tbody></table>` : '<p class="muted">No hits.</p>'}</div></div>
${noiseSection(d)}
${notesSectionHtml(d.notes)}</section>`);
  return sec;
}
