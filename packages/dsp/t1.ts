import { stabilizationDiagram } from './src/modal/lscf.ts';
import { closeModes } from './src/modal/close-modes.ts';
const m = closeModes([0, 4], 0.01);
for (const [tb, w] of [['data','unit'],['data','rms'],['band','unit'],['band','rms']] as const) {
 const d = stabilizationDiagram(m.set, { bandHz: [95, 106], orders: [2, 4, 6, 8, 10], timeBase: tb, weighting: w });
 for (const o of d.orders.slice(2)) console.log(tb, w, o.order, o.poles.map(p => `${p.fHz.toFixed(3)} ${(p.zeta*100).toFixed(3)} ${p.stable}`).join(' | '));
}
