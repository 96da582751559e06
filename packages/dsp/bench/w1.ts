// Workload W1: 120 DOFs × 5 hits × (1 force + 3 responses) × 16384 samples at 12.8 kHz, force window
// and exponential window, averaged into H1/H2/coherence per DOF with averageFrf.
// Run: pnpm --filter @resonote/dsp bench   (node --import tsx bench/w1.ts)
// When python3 with numpy is available, the same workload runs in numpy (bench/w1_numpy.py) and the
// ratio Node/numpy is printed. Data generation is not timed.
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import FFT from 'fft.js';
import { averageFrf, type Hit } from '../src/index.ts';
import { useFastFft, useReferenceFft } from '../src/fast-fft.ts';

const DOFS = 120;
const HITS = 5;
const RESPONSES = 3;
const N = 16384;
const FS = 12800;
const REPEATS = 3;
const forceWindow = { startS: 0.01, lengthS: 0.01, taperS: 0.005 };
const exponentialWindow = { startS: 0.01, tauS: 0.3 };

/** Deterministic pseudo-noise in [−1, 1), the same formula as w1_numpy.py. */
function hashNoise(i: number, seed: number): number {
  const v = Math.sin(i * 12.9898 + seed * 78.233) * 43758.5453;
  return 2 * (v - Math.floor(v)) - 1;
}

function makeDof(d: number): Hit[] {
  const hits: Hit[] = [];
  for (let h = 0; h < HITS; h++) {
    const seed = d * 16 + h * 4;
    const amp = 80 + 10 * h + (d % 7);
    const force = new Float64Array(N);
    const t0 = 0.01;
    const tc = 0.0008;
    for (let i = 0; i < N; i++) {
      const t = i / FS - t0;
      force[i] = (t >= 0 && t <= tc ? amp * Math.sin((Math.PI * t) / tc) : 0) + 0.05 * hashNoise(i, seed);
    }
    const responses: Float64Array[] = [];
    for (let r = 0; r < RESPONSES; r++) {
      const x = new Float64Array(N);
      for (let i = 0; i < N; i++) {
        const t = i / FS - t0;
        let v = 0;
        if (t > 0) {
          for (let m = 0; m < 3; m++) {
            const f = 40 + 35 * m * (1 + 0.1 * r) + (d % 5);
            v += Math.exp(-0.01 * 2 * Math.PI * f * t) * Math.sin(2 * Math.PI * f * t) * (1 + m + r);
          }
        }
        x[i] = amp * 0.01 * v + 0.002 * hashNoise(i, seed + r + 1);
      }
      responses.push(x);
    }
    hits.push({ force, responses });
  }
  return hits;
}

console.log(`W1: ${DOFS} DOFs × ${HITS} hits × (1 force + ${RESPONSES} responses) × ${N} samples at ${FS} Hz`);
const tg = performance.now();
const data: Hit[][] = [];
for (let d = 0; d < DOFS; d++) data.push(makeDof(d));
console.log(`data generated in ${((performance.now() - tg) / 1000).toFixed(1)} s (not timed)`);

let check = 0;
const run = (): number => {
  const t = performance.now();
  for (let d = 0; d < DOFS; d++) {
    const r = averageFrf(data[d], FS, { forceWindow, exponentialWindow });
    if (d === 0) {
      let s = 0;
      for (let k = 1; k < r.f.length; k++) s += Math.hypot(r.h1[0].re[k], r.h1[0].im[k]);
      check = s / (r.f.length - 1);
    }
  }
  return (performance.now() - t) / 1000;
};
const timeEngine = (label: string): number => {
  run(); // warm-up (JIT, FFT plan)
  const times: number[] = [];
  for (let i = 0; i < REPEATS; i++) times.push(run());
  const best = Math.min(...times);
  console.log(`${label}: best ${best.toFixed(3)} s of ${REPEATS} runs [${times.map((t) => t.toFixed(3)).join(', ')}]; mean |H1| DOF 0 ch 0 = ${check.toPrecision(8)}`);
  return best;
};
// The double-precision path (fft.js), the default everywhere, then the server's fast path
// (PFFFT WebAssembly SIMD, float32; src/fast-fft.ts) on the same data in the same process.
useReferenceFft();
const nodeRef = timeEngine('node fft.js (float64)      ');
const fast = await useFastFft();
const nodeFast = fast ? timeEngine('node PFFFT wasm SIMD (f32) ') : Number.NaN;
if (!fast) console.log('node PFFFT wasm SIMD (f32) : not available in this runtime; skipped');
useReferenceFft();
const node = fast ? nodeFast : nodeRef;

// The least transform work any implementation built on fft.js (design.md: "fft.js for the FFT") must do
// for W1: one complex transform of N/2 points per real record (the real-input FFT of src/fft.ts), with
// nothing else — no windows, no split into the one-sided spectrum, no averaging.
const half = new FFT(N / 2);
const spectrum = new Float64Array(N);
const floorRun = (): number => {
  const t = performance.now();
  for (const hits of data) {
    for (const h of hits) {
      half.transform(spectrum, h.force as Float64Array);
      for (const r of h.responses) half.transform(spectrum, r as Float64Array);
    }
  }
  return (performance.now() - t) / 1000;
};
floorRun();
const floor = Math.min(floorRun(), floorRun(), floorRun());
const records = DOFS * HITS * (1 + RESPONSES);
console.log(`fft.js : ${records} complex transforms of ${N / 2} points alone (the floor under fft.js): best ${floor.toFixed(3)} s = ${((floor / records) * 1e6).toFixed(0)} µs per record`);

const here = dirname(fileURLToPath(import.meta.url));
const hasNumpy = spawnSync('python3', ['-c', 'import numpy'], { stdio: 'ignore' }).status === 0;
if (!hasNumpy) {
  console.log('numpy  : python3 with numpy not found; skipped');
} else {
  const script = join(here, 'w1_numpy.py');
  const runPy = (env: NodeJS.ProcessEnv) => {
    const p = spawnSync('python3', [script, String(DOFS), String(HITS), String(RESPONSES), String(N), String(FS), String(REPEATS)], {
      env,
      encoding: 'utf8',
    });
    if (p.status !== 0) throw new Error(`w1_numpy.py failed: ${p.stderr}`);
    return JSON.parse(p.stdout.trim().split('\n').pop() as string) as { best: number; times: number[]; check: number; numpy: string };
  };
  // numpy allocates large temporaries and the FRF outputs are fresh typed arrays: on VMs where
  // returning memory to the OS makes every new allocation page-fault (this one), glibc's malloc
  // settings change both sides a lot. numpy therefore runs twice: in this process's environment
  // (the fair pairing for the node figure above) and with malloc keeping freed memory (numpy's best
  // case). Run `MALLOC_MMAP_THRESHOLD_=1000000000 MALLOC_TRIM_THRESHOLD_=1000000000
  // MALLOC_TOP_PAD_=268435456 pnpm --filter @resonote/dsp bench` for node under the same settings.
  const tunedEnv = { MALLOC_MMAP_THRESHOLD_: '1000000000', MALLOC_TRIM_THRESHOLD_: '1000000000', MALLOC_TOP_PAD_: '268435456' };
  const nodeTuned = process.env.MALLOC_MMAP_THRESHOLD_ === tunedEnv.MALLOC_MMAP_THRESHOLD_;
  const same = runPy(process.env);
  const tuned = runPy({ ...process.env, ...tunedEnv });
  const fmt = (r: typeof same) => `best ${r.best.toFixed(3)} s [${r.times.map((t) => t.toFixed(3)).join(', ')}]`;
  console.log(`numpy ${same.numpy} (same environment as node${nodeTuned ? ', malloc keeps memory' : ', default malloc'}): ${fmt(same)}; mean |H1| DOF 0 ch 0 = ${same.check.toPrecision(8)}`);
  if (!nodeTuned) console.log(`numpy ${tuned.numpy} (malloc keeps memory): ${fmt(tuned)}`);
  console.log(`ratio node/numpy, same environment: fast path = ${(node / same.best).toFixed(2)} (target ≤ 1.00); fft.js path = ${(nodeRef / same.best).toFixed(2)}`);
  if (!nodeTuned) {
    console.log(`ratio node/numpy, against numpy's best case = ${(node / tuned.best).toFixed(2)}; fft.js floor/numpy's best case = ${(floor / tuned.best).toFixed(2)}`);
  }
}
