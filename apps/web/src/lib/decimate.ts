// Min/max decimation for drawing long curves: each bucket of consecutive lines keeps its lowest
// and highest point, in frequency order, so peaks and notches survive at the plot's resolution
// while a 100 × 8193-line overlay draws a fraction of the points.

/** Returns x, y with at most 2·buckets points; input shorter than that comes back unchanged. */
export function minMaxDecimate(x: Float64Array, y: Float64Array, buckets: number): { x: Float64Array; y: Float64Array } {
  const n = Math.min(x.length, y.length);
  if (!(buckets >= 1)) throw new RangeError(`buckets=${buckets} must be ≥ 1`);
  if (n <= 2 * buckets) return { x, y };
  const ox = new Float64Array(2 * buckets);
  const oy = new Float64Array(2 * buckets);
  let m = 0;
  for (let b = 0; b < buckets; b++) {
    const from = Math.floor((b * n) / buckets);
    const to = Math.floor(((b + 1) * n) / buckets);
    let lo = from;
    let hi = from;
    for (let k = from + 1; k < to; k++) {
      const v = y[k]!;
      if (v < y[lo]! || Number.isNaN(y[lo]!)) lo = k;
      if (v > y[hi]! || Number.isNaN(y[hi]!)) hi = k;
    }
    const first = Math.min(lo, hi);
    const second = Math.max(lo, hi);
    ox[m] = x[first]!;
    oy[m++] = y[first]!;
    if (second !== first) {
      ox[m] = x[second]!;
      oy[m++] = y[second]!;
    }
  }
  return { x: ox.subarray(0, m), y: oy.subarray(0, m) };
}

/** Whether WebGL can be used for plotly's scattergl traces (the same test as the 3D view). */
let webgl: boolean | undefined;
export function webglUsable(): boolean {
  if (webgl !== undefined) return webgl;
  try {
    const canvas = document.createElement('canvas');
    const gl = (canvas.getContext('webgl') ?? canvas.getContext('experimental-webgl')) as WebGLRenderingContext | null;
    webgl = Boolean(gl && gl.getExtension('OES_element_index_uint') && gl.getExtension('ANGLE_instanced_arrays'));
    // A software rasteriser (no GPU) draws WebGL slower than the browser draws SVG: measured on a
    // 2-core machine without a GPU, 100 decimated FRFs took 2.1–2.7 s with scattergl and 0.9 s as
    // SVG (tests/bench/overlay.ts; docs/decisions/overlay-rendering.md).
    const info = gl?.getExtension('WEBGL_debug_renderer_info');
    const renderer = info && gl ? String(gl.getParameter(info.UNMASKED_RENDERER_WEBGL)) : '';
    if (/swiftshader|llvmpipe|software/i.test(renderer)) webgl = false;
    gl?.getExtension('WEBGL_lose_context')?.loseContext();
  } catch {
    webgl = false;
  }
  return webgl;
}
