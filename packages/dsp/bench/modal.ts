// Benchmark (not a test) of the modal-analysis numerics: fits of 60 FRFs × 2000 lines over model orders
// 2…40 (the poly-reference LSCF stabilization diagram, then the residue fit for the stable poles), and the
// wide-band fits of issue 14: 60 FRFs × 4000 lines at orders 2…120, and the 16-mode plate of test/structures.ts.
// Run: cd packages/dsp && node --import tsx bench/modal.ts
import { estimateShapes, pickStablePoles, stabilizationDiagram, suggestModes, type FrfSet } from '../src/modal/index.ts';

/** mulberry32 (public-domain 32-bit PRNG) and Box–Muller, so every run fits the same data. */
function gaussian(seed: number): () => number {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(u() || 1e-300)) * Math.cos(2 * Math.PI * u());
}

/** Receptances of a 12-mode structure (modal sum, docs/methods.md#modal-model) with 1 % relative noise. */
function dataset(nResp: number, refs: number[], nLines: number): FrfSet {
  const rnd = gaussian(11);
  const fn = [42, 95, 133, 190, 251, 318, 377, 455, 530, 612, 700, 845];
  const zeta = fn.map((_, r) => 0.004 + 0.0015 * (r % 5));
  const shapes = fn.map(() => Array.from({ length: nResp }, () => rnd()));
  const f = Float64Array.from({ length: nLines }, (_, k) => k * 0.5); // 0…999.5 Hz
  const frfs: FrfSet['frfs'] = [];
  for (const j of refs) {
    for (let i = 0; i < nResp; i++) {
      const re = new Float64Array(nLines);
      const im = new Float64Array(nLines);
      for (let k = 0; k < nLines; k++) {
        const w = 2 * Math.PI * f[k];
        let hr = 0;
        let hi = 0;
        for (let r = 0; r < fn.length; r++) {
          const wr = 2 * Math.PI * fn[r];
          const a = wr * wr - w * w;
          const b = 2 * zeta[r] * wr * w;
          const d = a * a + b * b;
          const A = shapes[r][i] * shapes[r][j];
          hr += (A * a) / d;
          hi -= (A * b) / d;
        }
        const m = Math.hypot(hr, hi);
        re[k] = hr + 0.01 * m * rnd();
        im[k] = hi + 0.01 * m * rnd();
      }
      frfs.push({ response: `p${i}`, reference: `p${j}`, h: { re, im } });
    }
  }
  return { f, frfs, kind: 'receptance' };
}

const orders = Array.from({ length: 20 }, (_, i) => 2 * i + 2);
for (const [label, nResp, refs, pickOrder] of [
  ['60 responses × 1 reference', 60, [0], 40],
  ['30 responses × 2 references', 30, [0, 17], 30],
] as const) {
  const set = dataset(nResp, [...refs], 2000);
  const bandHz: [number, number] = [10, 990];
  stabilizationDiagram(set, { bandHz, orders: [2, 4] }); // warm-up (JIT)
  const t0 = performance.now();
  const diagram = stabilizationDiagram(set, { bandHz, orders });
  const t1 = performance.now();
  // poles stable in all checks at order 40 (1 reference) or 30 (2 references: at the highest orders the
  // over-modelled 2-reference fit also stabilises a few noise poles beside the physical ones; see pickStablePoles)
  const poles = pickStablePoles(diagram, pickOrder);
  const model = estimateShapes(set, poles, { bandHz });
  const t2 = performance.now();
  console.log(
    `${label}, ${set.frfs.length} FRFs × ${set.f.length} lines, orders 2…40 step 2: ` +
      `stabilization ${(t1 - t0).toFixed(0)} ms + shapes of ${model.modes.length} stable poles ${(t2 - t1).toFixed(0)} ms ` +
      `= ${((t2 - t0) / 1000).toFixed(2)} s`,
  );
  console.log(`  stable poles at order ${pickOrder} (Hz): ${poles.map((p) => p.fHz.toFixed(1)).join(', ')}`);
  // With one reference, 12 modes need order ≥ 24 to show; most columns start at orders 34–38 of 2…40, under
  // the suggestion's 40 % of the orders, so it keeps only the earliest ones (orders to 120 below: all 12).
  console.log(`  suggested modes (Hz): ${suggestModes(diagram).map((m) => m.frequencyHz.toFixed(1)).join(', ')}`);
}

// Wide-band fits (issue 14 targets: ≤ 5 s and ≤ 3 s on 2 cores).
import { lines, measure, widePlate } from '../test/structures.ts';
{
  const set = dataset(60, [0], 4000);
  const bandHz: [number, number] = [10, 1995]; // 3971 of the 4000 lines
  const orders120 = Array.from({ length: 60 }, (_, i) => 2 * i + 2);
  const t0 = performance.now();
  const diagram = stabilizationDiagram(set, { bandHz, orders: orders120 });
  const t1 = performance.now();
  const modes = suggestModes(diagram);
  console.log(
    `60 responses × 1 reference, ${set.f.length} lines (${diagram.lines} in the band), orders 2…120 step 2: ` +
      `stabilization ${((t1 - t0) / 1000).toFixed(2)} s (target ≤ 5 s); ${modes.length} modes suggested`,
  );
}
{
  const { model } = widePlate();
  const set = measure(model, { f: lines(0.5, 6401), responses: [14], references: model.dofs.map((_, i) => i), kind: 'accelerance', tauS: 2 / Math.log(100), noise: { relative: 0.002, floor: 5e-5, seed: 7 } });
  const bandHz: [number, number] = [60, 1460];
  const orders120 = Array.from({ length: 60 }, (_, i) => 2 * i + 2);
  const t0 = performance.now();
  const diagram = stabilizationDiagram(set, { bandHz, orders: orders120 });
  const modes = suggestModes(diagram);
  const poles = modes.map((m) => diagram.orders.find((o) => o.order === m.representative.order)!.poles[m.representative.index]);
  const model2 = estimateShapes(set, poles.map((p) => ({ lambda: p.lambda })), { bandHz });
  const t1 = performance.now();
  console.log(
    `plate (Leissa 1969), 20 FRFs × ${diagram.lines} lines over 60–1460 Hz, orders 2…120: diagram + suggestion + shapes ` +
      `${((t1 - t0) / 1000).toFixed(2)} s (target ≤ 3 s); ${modes.length} of 16 modes, ${model2.modes.length} shapes`,
  );
}
{
  // the same plate with two accelerometers (P15, P12): two references, orders to 120 (no target; printed for the record)
  const { model } = widePlate();
  const set = measure(model, { f: lines(0.5, 6401), responses: [14, 11], references: model.dofs.map((_, i) => i), kind: 'accelerance', tauS: 2 / Math.log(100), noise: { relative: 0.002, floor: 5e-5, seed: 9 } });
  const t0 = performance.now();
  const diagram = stabilizationDiagram(set, { bandHz: [60, 1460], orders: Array.from({ length: 60 }, (_, i) => 2 * i + 2) });
  const modes = suggestModes(diagram);
  const t1 = performance.now();
  console.log(`plate, 2 references, 40 FRFs × ${diagram.lines} lines, orders 2…120: diagram + suggestion ${((t1 - t0) / 1000).toFixed(2)} s; ${modes.length} of 16 modes`);
}
