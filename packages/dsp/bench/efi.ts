// Benchmark (not a test) of Effective Independence (Kammer 1991) as the Plan step would run it: the
// modes of a simply supported plate, sin(mπx/a)·sin(nπy/b) (Blevins 1979), out-of-plane at a grid of
// candidate nodes, reduced to 30 sensors; then the driving-point measure and the auto-MAC of the kept set.
// Run: cd packages/dsp && node --import tsx bench/efi.ts
import { autoMac, drivingPointMeasure, effectiveIndependence } from '../src/correlation/index.ts';

function plateModes(nx: number, ny: number, count: number): Float64Array[] {
  const pairs: [number, number][] = [];
  for (let m = 1; m <= 10; m++) for (let n = 1; n <= 10; n++) pairs.push([m, n]);
  // a = 1.0, b = 0.6: frequency ∝ (m/a)² + (n/b)²; the lowest `count` modes
  pairs.sort((p, q) => p[0] ** 2 + (p[1] / 0.6) ** 2 - (q[0] ** 2 + (q[1] / 0.6) ** 2));
  return pairs.slice(0, count).map(([m, n]) => {
    const s = new Float64Array(nx * ny);
    for (let i = 0; i < nx; i++) for (let j = 0; j < ny; j++) s[i * ny + j] = Math.sin((m * Math.PI * (i + 1)) / (nx + 1)) * Math.sin((n * Math.PI * (j + 1)) / (ny + 1));
    return s;
  });
}

import { loadavg } from 'node:os';

// warm the JIT on a small case first (the first runs of a cold process are several times slower)
for (let k = 0; k < 8; k++) effectiveIndependence(plateModes(20, 10, 8), { target: 20 });
console.log(`load average ${loadavg().map((v) => v.toFixed(1)).join(' ')} (the machine is shared: figures vary with it)`);

for (const [nx, ny, modes] of [[25, 20, 12], [50, 40, 20], [100, 50, 20]] as const) {
  const shapes = plateModes(nx, ny, modes);
  const times: number[] = [];
  let kept = 0;
  let info = 0;
  for (let run = 0; run < 3; run++) {
    const t0 = performance.now();
    const r = effectiveIndependence(shapes, { target: 30 });
    times.push(performance.now() - t0);
    kept = r.kept.length;
    info = r.informationKept;
  }
  const t1 = performance.now();
  const dp = drivingPointMeasure(shapes);
  const tDp = performance.now() - t1;
  const r = effectiveIndependence(shapes, { target: 30 });
  const am = autoMac(shapes.map((s) => Array.from(r.kept, (i) => s[i]!)));
  console.log(
    `${nx * ny} candidates × ${modes} modes → ${kept} kept: EfI best of 3 ${Math.min(...times).toFixed(0)} ms ` +
      `(det kept/all ${info.toExponential(2)}), driving-point ${tDp.toFixed(1)} ms (best ${dp.ranking[0]}), ` +
      `auto-MAC max off-diagonal ${am.maxOffDiagonal!.value.toFixed(3)}`,
  );
}
