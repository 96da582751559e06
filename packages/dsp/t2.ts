import { stabilizationDiagram } from './src/modal/lscf.ts';
import { clusterStablePoles } from './src/modal/clusters.ts';
import { widePlate, measure, lines } from './test/structures.ts';
const { model } = widePlate();
const T = 2, tau = T / Math.log(100);
const set = measure(model, { f: lines(0.5, 6401), responses: [6], references: model.dofs.map((_, i) => i), kind: 'accelerance', tauS: tau, noise: { relative: 0.005, floor: 1e-4, seed: 7 } });
const truth = model.modes.filter(m => m.fHz > 60 && m.fHz < 1460);
const orders = Array.from({ length: 60 }, (_, i) => 2 * i + 2);
for (const [tb, w] of [['band', 'rms'], ['band', 'rms']] as const) {
  const t0 = performance.now();
  const d = stabilizationDiagram(set, { bandHz: [60, 1460], orders, timeBase: tb, weighting: w });
  const t1 = performance.now();
  const cl = clusterStablePoles(d);
  let found = 0; const errs: string[] = [];
  for (const m of truth) {
    const top = d.orders.at(-1)!.poles;
    const p = top.reduce((a, b) => Math.abs(b.fHz - m.fHz) < Math.abs(a.fHz - m.fHz) ? b : a);
    const e = Math.abs(p.fHz - m.fHz) / m.fHz;
    if (e < 1e-3) found++;
    errs.push((e * 100).toFixed(3));
  }
  const nAll = d.orders.map(o => o.poles.filter(p => p.stable === 'all').length);
  console.log(tb, w, `${(t1 - t0).toFixed(0)} ms`, 'found@120', found, '/', truth.length, 'clusters', cl.length, 'stable per order(last10)', nAll.slice(-10).join(','));
  console.log('  err% ', errs.join(' '));
}
