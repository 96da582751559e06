// Starts loading plotly (a large module) as soon as a screen that will plot opens, so the first
// plot does not wait for it once data arrives.
declare global {
  interface Window {
    __resonotePlotlyReady?: boolean;
  }
}

let loading: Promise<unknown> | null = null;

export function preloadPlotly(): Promise<unknown> {
  loading ??= import('plotly.js-dist-min').then((m) => {
    window.__resonotePlotlyReady = true;
    return m;
  });
  return loading;
}
