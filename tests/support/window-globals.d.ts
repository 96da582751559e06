// What the web app puts on window for tests and benchmarks (apps/web/src/components/review/overlay-chart.tsx,
// apps/web/src/lib/preload-plotly.ts).
export {};
declare global {
  interface Window {
    __resonoteOverlayTimings?: { curves: number; points: number; ms: number }[];
    __resonotePlotlyReady?: boolean;
  }
}
