// The end of the hand-over report: the safety cautions and the appendices that trace every FRF
// and mode to its stored inputs.
import type { HandoverData } from './handover-data.ts';
import { mono } from './report-words.ts';
import { esc } from './svg-frame.ts';

/** 10. Safety and interpretation. */
export function cautionsSection(d: HandoverData): string[] {
  const sec: string[] = [];
  // 10. Cautions
  sec.push(`<section class="keep caution"><h2>10. Safety and interpretation</h2><ul>
<li>Secure the structure and the hammer before testing; wear eye protection (tips and chips can fly).</li>
<li>Keep clear of rotating or energised machinery; isolate and lock out before touching it.</li>
<li>Do not test structures in service without the owner's procedures and permission.</li>
<li>The results describe the structure as supported and measured in this campaign (supports, mass loading by the sensors, temperature). Structural judgements drawn from them — fitness for purpose, remaining life, compliance — belong to licensed practice under local codes.</li>
</ul></section>`);
  return sec;
}

/** Appendices A–C: where each FRF and mode comes from, point coordinates. */
export function appendixSection(d: HandoverData): string[] {
  const m = d.modes;
  const sec: string[] = [];
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
  return sec;
}
