// Types for the part of the Emscripten module of @echogarden/pffft-wasm that fast-fft.ts uses
// (the package ships no declarations; the C API is PFFFT's pffft.h, J. Pommier).
declare module '@echogarden/pffft-wasm/simd' {
  export interface PffftModule {
    HEAPF32: Float32Array;
    _pffft_new_setup(n: number, transform: number): number;
    _pffft_destroy_setup(setup: number): void;
    _pffft_transform_ordered(setup: number, input: number, output: number, work: number, direction: number): void;
    _pffft_aligned_malloc(bytes: number): number;
    _pffft_aligned_free(ptr: number): void;
    _pffft_simd_size(): number;
  }
  const factory: (moduleArg?: Record<string, unknown>) => Promise<PffftModule>;
  export default factory;
}
