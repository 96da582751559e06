// The server's fast real FFT: PFFFT (J. Pommier, "PFFFT: a pretty fast FFT", after FFTPACK,
// P. N. Swarztrauber 1982) compiled to WebAssembly with 128-bit SIMD, from @echogarden/pffft-wasm
// (BSD-3-Clause; the .wasm ships inside the package, nothing is fetched). It serves the lengths PFFFT
// takes (multiples of 32 whose only prime factors are 2, 3 and 5: powers of two, and e.g. 48 000 for
// 1 s at 48 kHz) behind the RealFftPlan interface of fft.ts; every other length, and every process
// that never calls useFastFft() (the browser, the tests by default), keeps fft.js in double precision.
//
// Precision: PFFFT computes in float32 (unit roundoff u = 2⁻²⁴ ≈ 5.96e-8, ≈ 7.2 significant digits).
// Inputs are rounded to float32 on the way in and the spectrum comes back as float32; the sums of the
// averaging engine stay in float64. For what this means for 24-bit data see docs/decisions/fast-fft.md.
// Separate entry point (@resonote/dsp/fast-fft) so the web bundle never pulls the WebAssembly glue.
/// <reference path="./pffft-wasm.d.ts" />
import { addCrossLine, setFastPlanFactory, type ForwardCross, type RealFftPlan } from './fft.ts';
import type { PffftModule } from '@echogarden/pffft-wasm/simd';

const PFFFT_REAL = 0; // pffft.h: typedef enum { PFFFT_REAL, PFFFT_COMPLEX }
const PFFFT_FORWARD = 0; // pffft.h: typedef enum { PFFFT_FORWARD, PFFFT_BACKWARD }

/**
 * One PFFFT setup with its input, output and work buffers in WebAssembly memory, allocated once.
 * pffft_transform_ordered's real output (pffft.h): out[0] = X_0, out[1] = X_{N/2}, then
 * out[2k], out[2k+1] = Re X_k, Im X_k for k = 1 … N/2 − 1; unscaled, X_k = Σ x_n e^{−j2πkn/N}.
 */
class PffftPlan implements RealFftPlan {
  readonly bins: number;
  private readonly setup: number;
  private readonly inPtr: number;
  private readonly outPtr: number;
  private readonly workPtr: number;

  constructor(
    private readonly mod: PffftModule,
    readonly n: number,
    setup: number,
  ) {
    this.bins = (n >>> 1) + 1;
    this.setup = setup;
    this.inPtr = mod._pffft_aligned_malloc(4 * n);
    this.outPtr = mod._pffft_aligned_malloc(4 * n);
    this.workPtr = mod._pffft_aligned_malloc(4 * n);
    if (!this.inPtr || !this.outPtr || !this.workPtr) throw new RangeError(`no WebAssembly memory for an FFT of ${n} points`);
  }

  /** Rounds input to float32 into WebAssembly memory, transforms, and returns the heap and output offset. */
  private run(input: Float64Array): { heap: Float32Array; o: number } {
    // Read HEAPF32 on every call: a memory growth (another plan's malloc) replaces the view.
    const heap = this.mod.HEAPF32;
    heap.set(input.length === this.n ? input : input.subarray(0, this.n), this.inPtr >>> 2);
    this.mod._pffft_transform_ordered(this.setup, this.inPtr, this.outPtr, this.workPtr, PFFFT_FORWARD);
    return { heap: this.mod.HEAPF32, o: this.outPtr >>> 2 };
  }

  forward(input: Float64Array, outRe: Float64Array, outIm: Float64Array): void {
    const { heap, o } = this.run(input);
    const m = this.n >>> 1;
    outRe[0] = heap[o];
    outIm[0] = 0;
    outRe[m] = heap[o + 1];
    outIm[m] = 0;
    for (let k = 1; k < m; k++) {
      outRe[k] = heap[o + 2 * k];
      outIm[k] = heap[o + 2 * k + 1];
    }
  }

  forwardCross: ForwardCross = (input, refRe, refIm, auto, crossRe, crossIm) => {
    const { heap, o } = this.run(input);
    const m = this.n >>> 1;
    // The sums read the spectrum straight from WebAssembly memory (no copy) and stay in float64.
    const x0 = heap[o];
    const xm = heap[o + 1];
    addCrossLine(0, x0, 0, refRe, refIm, auto, crossRe, crossIm);
    addCrossLine(m, xm, 0, refRe, refIm, auto, crossRe, crossIm);
    for (let k = 1; k < m; k++) addCrossLine(k, heap[o + 2 * k], heap[o + 2 * k + 1], refRe, refIm, auto, crossRe, crossIm);
    return x0;
  };
}

let loaded: PffftModule | null = null;

/** The PFFFT plan for n, or null when PFFFT does not take n (real input: a multiple of 32 with prime factors 2, 3, 5 only; pffft_new_setup answers 0 otherwise). */
export function pffftPlan(mod: PffftModule, n: number): RealFftPlan | null {
  if (n < 32 || n % 32 !== 0) return null;
  const setup = mod._pffft_new_setup(n, PFFFT_REAL);
  if (!setup) return null;
  return new PffftPlan(mod, n, setup);
}

/**
 * Loads the SIMD WebAssembly build of PFFFT and makes it the plan source for the lengths it takes
 * (see pffftPlan; the name 'pffft-wasm-simd-f32-235' keys stored results, hits/entry-result.ts). Resolves true when the fast path is active, false when this runtime cannot run it (no
 * WebAssembly, or no 128-bit SIMD): fft.js then stays in use. Idempotent. Call once at start.
 */
export async function useFastFft(): Promise<boolean> {
  if (!loaded) {
    if (typeof (globalThis as { WebAssembly?: unknown }).WebAssembly !== 'object') return false;
    try {
      const { default: factory } = await import('@echogarden/pffft-wasm/simd');
      loaded = await factory();
    } catch {
      return false;
    }
  }
  const mod = loaded;
  setFastPlanFactory((n) => pffftPlan(mod, n), 'pffft-wasm-simd-f32-235');
  return true;
}

/** Removes the fast plan source: fft.js serves every length again (tests and benches compare both). */
export function useReferenceFft(): void {
  setFastPlanFactory(null);
}
