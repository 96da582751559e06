// plotly.js-dist-min ships without types; the app uses only these four calls.
declare module 'plotly.js-dist-min' {
  export interface PlotlyHTMLElement extends HTMLDivElement {
    on(event: string, handler: (event: unknown) => void): void;
    removeAllListeners?(event: string): void;
  }
  const Plotly: {
    react(div: HTMLDivElement, data: unknown[], layout?: Record<string, unknown>, config?: Record<string, unknown>): Promise<PlotlyHTMLElement>;
    purge(div: HTMLDivElement): void;
    Plots: { resize(div: HTMLDivElement): void };
  };
  export default Plotly;
}
