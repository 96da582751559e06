// Sections 7–9 of the hand-over report and the correlation with the FE model: FRFs, checks, modes.
import type { HandoverData } from './handover-data.ts';
import { DB_REFERENCE, dateTime, mono, n, shade } from './report-words.ts';
import { esc } from './svg-frame.ts';
import { modeShapeSvg } from './svg-geometry.ts';
import { frequencyPairSvg, frfThumbSvg } from './svg-plots.ts';

/** 7. The schedule with each FRF's mean coherence, and FRF/coherence thumbnails. */
export function frfsSection(d: HandoverData): string[] {
  const s = d.settings.settings;
  const sec: string[] = [];
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
  return sec;
}

/** 8. Reciprocity and linearity checks (none without results). */
export function checksSection(d: HandoverData): string[] {
  const sec: string[] = [];
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
  return sec;
}

/** 9. The mode table: rows, MAC matrix, mass-normalised shapes, mode shapes. */
export function modesSection(d: HandoverData): string[] {
  const sec: string[] = [];
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
  return sec;
}

/** Test against the FE model: pairs by MAC, frequency differences, MAC matrix, cross-orthogonality, frequency plot. */
export function correlationSection(d: HandoverData): string {
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
