import { stabilizationDiagram } from './src/modal/lscf.ts';
import { clusterStablePoles } from './src/modal/clusters.ts';
import { widePlate, measure, lines } from './test/structures.ts';
const { model } = widePlate();
const T = 2, tau = T / Math.log(100);
const set = measure(model, { f: lines(0.5, 6401), responses: [6], references: model.dofs.map((_, i) => i), kind: 'accelerance', tauS: tau, noise: { relative: 0.005, floor: 1e-4, seed: 7 } });
const truth = model.modes.filter(m => m.fHz > 60 && m.fHz < 1460);
const orders = Array.from({ length: 60 }, (_, i) => 2 * i + 2);
const band: [number, number] = [60, 1460];
for (const c of [1, 1.25, 1.5, 2]) {
  const t0 = performance.now();
  const d = stabilizationDiagram(set, { bandHz: band, orders, dtS: 1 / (2 * c * band[1]) });
  const t1 = performance.now();
  for (const ord of [40, 60, 80, 120]) {
    const top = d.orders.find(o => o.order === ord)!.poles;
    let found = 0; let worst = 0; let zw = 0;
    for (const m of truth) {
      const p = top.reduce((a, b) => Math.abs(b.fHz - m.fHz) < Math.abs(a.fHz - m.fHz) ? b : a);
      const e = Math.abs(p.fHz - m.fHz) / m.fHz;
      if (e < 1e-3) found++;
      worst = Math.max(worst, e);
      const wn = 2*Math.PI*m.fHz; const sig = m.zeta*wn + 1/tau; const zt = sig/Math.hypot(sig, wn*Math.sqrt(1-m.zeta**2));
      zw = Math.max(zw, Math.abs(p.zeta/zt-1));
    }
    console.log(c, ord, `${(t1 - t0).toFixed(0)} ms`, 'found', found, 'worst f', (worst * 100).toFixed(4), '% worst zeta(windowed) rel', zw.toFixed(4), 'nAll', top.filter(p => p.stable === 'all').length, 'clusters', clusterStablePoles(d).length);
  }
}
