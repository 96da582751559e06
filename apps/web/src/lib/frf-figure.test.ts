import { describe, expect, it } from 'vitest';
import { bandFromRelayout, frfFigure, linesToDraw } from './frf-figure.ts';
import { plotColours } from './plot-style.ts';

/** 0, 0.5, 1, … Hz: lines of a 2-s record. */
const axis = (lines: number) => Float64Array.from({ length: lines }, (_, k) => k * 0.5);

describe('lines drawn for a zoomed frequency band', () => {
  it('keeps the lines inside the band and one either side, so the curve reaches both edges of the plot', () => {
    const f = axis(201); // 0 … 100 Hz
    const [from, to] = linesToDraw(f, false, [10.2, 20.2]);
    expect(f[from]).toBe(10); // last line below 10.2 Hz
    expect(f[to - 1]).toBe(20.5); // first line above 20.2 Hz
  });

  it('leaves out the 0 Hz line on a log axis, and draws everything without a band', () => {
    const f = axis(201);
    expect(linesToDraw(f, true, null)).toEqual([1, 201]);
    expect(linesToDraw(f, true, [0.01, 5])).toEqual([1, 12]);
    expect(linesToDraw(f, false, undefined)).toEqual([0, 201]);
  });

  it('draws at least one line when the band lies beyond the measured lines', () => {
    const [from, to] = linesToDraw(axis(201), false, [500, 600]);
    expect(to - from).toBe(1);
  });
});

describe('an overlay figure after a zoom', () => {
  const lines = 8193;
  const f = axis(lines);
  // A resonance-like curve: |H| = 1/|1 − (f/f0)² + j·2ζ·f/f0| with f0 = 1000 Hz, ζ = 1 %.
  const re = new Float64Array(lines);
  const im = new Float64Array(lines);
  for (let k = 0; k < lines; k++) {
    const r = f[k]! / 1000;
    const a = 1 - r * r;
    const b = 0.02 * r;
    re[k] = a / (a * a + b * b);
    im[k] = -b / (a * a + b * b);
  }
  const curve = { name: 'H1 B01 / B21', f, h: { re, im }, colour: '#333' };
  const options = { kind: 'receptance' as const, view: 'magphase' as const, db: true, logF: false, colours: plotColours(false), coherence: false, buckets: 300 };

  it('draws every line of the zoomed band where the whole axis is decimated to 600 points', () => {
    const whole = frfFigure([curve], options).data[0]!.x as Float64Array;
    expect(whole.length).toBeLessThanOrEqual(600);
    // 990–1010 Hz: 41 lines inside and one either side, fewer than the 600-point budget, so all drawn.
    const zoomed = frfFigure([curve], { ...options, bandHz: [990, 1010] }).data[0]!.x as Float64Array;
    expect(Array.from(zoomed)).toEqual(Array.from({ length: 43 }, (_, i) => 989.5 + 0.5 * i));
    const onWhole = Array.from(whole).filter((x) => x >= 990 && x <= 1010).length;
    expect(onWhole).toBeLessThan(10);
  });

  it('ignores the band in the Nyquist view, where the x axis is not frequency', () => {
    const nyquist = frfFigure([curve], { ...options, view: 'nyquist', bandHz: [990, 1010] }).data[0]!.x as Float64Array;
    expect(nyquist.length).toBe(lines);
  });
});

describe('the band of a plotly_relayout event', () => {
  it('reads a zoom box, a pan and a return to the whole axis', () => {
    expect(bandFromRelayout({ 'xaxis.range[0]': 120.5, 'xaxis.range[1]': 80, 'yaxis.range[0]': -40 }, false)).toEqual([80, 120.5]);
    expect(bandFromRelayout({ 'xaxis.range': [10, 20] }, false)).toEqual([10, 20]);
    expect(bandFromRelayout({ 'xaxis.autorange': true, 'yaxis.autorange': true }, false)).toBeNull();
  });

  it('turns a log axis range (log10 of the frequency) into Hz', () => {
    const band = bandFromRelayout({ 'xaxis.range[0]': 1, 'xaxis.range[1]': 2.5 }, true)!;
    expect(band[0]).toBeCloseTo(10, 12);
    expect(band[1]).toBeCloseTo(316.2278, 4);
  });

  it('leaves the band alone for events that do not touch the x axis', () => {
    expect(bandFromRelayout({ 'yaxis.range[0]': 0, 'yaxis.range[1]': 1 }, false)).toBeUndefined();
    expect(bandFromRelayout({ width: 800 }, false)).toBeUndefined();
    expect(bandFromRelayout({ 'xaxis.range[0]': 'abc', 'xaxis.range[1]': 3 }, false)).toBeUndefined();
  });
});

describe('phase and axis labels', () => {
  // A pure delay H = e^(−j·2π·f·τ), τ = 2.5 ms: the phase is −360°·f·τ = −0.9°·f exactly (shift theorem),
  // −360° at 400 Hz, so the wrapped phase jumps at 200 Hz and the unwrapped one is a straight line.
  const f = Float64Array.from({ length: 801 }, (_, k) => k * 0.5);
  const re = f.map((v) => Math.cos(-2 * Math.PI * v * 0.0025));
  const im = f.map((v) => Math.sin(-2 * Math.PI * v * 0.0025));
  const colours = plotColours(false);
  const fig = (unwrap: boolean, logF = false) => frfFigure([{ name: 'H1 P1:+Z / P1:+Z', f, h: { re, im }, colour: '#000' }], { kind: 'accelerance', view: 'magphase', db: true, logF, colours, coherence: false, unwrap });

  it('draws the phase continuous through ±180° when unwrapped, and wrapped to (−180°, 180°] otherwise', () => {
    const wrapped = fig(false).data[1]!.y as Float64Array;
    const unwrapped = fig(true).data[1]!.y as Float64Array;
    const jumps = (y: Float64Array) => y.slice(1).filter((v, i) => Math.abs(v - y[i]!) > 180).length;
    expect(jumps(wrapped)).toBeGreaterThan(0);
    expect(jumps(unwrapped)).toBe(0);
    expect(Math.max(...wrapped)).toBeLessThanOrEqual(180);
    f.forEach((v, k) => expect(unwrapped[k]).toBeCloseTo(-0.9 * v, 9));
    expect((fig(true).layout.yaxis2 as { range?: unknown }).range).toBeUndefined();
  });

  it('labels a log frequency axis 10, 20, 50 … (tickformat ~g, dtick D2), never "10.00"', () => {
    expect(fig(false, true).layout.xaxis).toMatchObject({ type: 'log', tickformat: '~g', dtick: 'D2' });
    expect((fig(false, false).layout.xaxis as { tickformat?: string }).tickformat).toBeUndefined();
  });
});

describe('a short FRF figure (Tap at 1024×768)', () => {
  const f = axis(5);
  const curve = { name: 'H1', f, h: { re: new Float64Array(5).fill(1), im: new Float64Array(5) }, coherence: new Float64Array(5).fill(1), colour: '#000' };
  const options = { kind: 'accelerance', view: 'magphase', db: true, logF: false, colours: plotColours(false), coherence: true } as const;
  const title = (layout: Record<string, unknown>, key: string) => ((layout[key] as { title: { text: string } }).title.text);

  it('names its three rows in a few characters, with fewer ticks, and the frequency once under the last row', () => {
    const { layout } = frfFigure([curve], { ...options, compact: true });
    expect([title(layout, 'yaxis'), title(layout, 'yaxis2'), title(layout, 'yaxis3')]).toEqual(['|H| dB', 'Phase °', 'γ²']);
    expect((layout.yaxis2 as { tickvals: number[] }).tickvals).toEqual([-180, 0, 180]);
    expect((layout.yaxis3 as { tickvals: number[] }).tickvals).toEqual([0, 1]);
    expect(title(layout, 'xaxis')).toBe('Frequency (Hz)');
    expect((layout.xaxis as { anchor: string }).anchor).toBe('y3');
  });

  it('keeps the full titles with units when there is room', () => {
    const { layout } = frfFigure([curve], options);
    expect([title(layout, 'yaxis'), title(layout, 'yaxis2'), title(layout, 'yaxis3')]).toEqual(['|H| (dB re 1 (m/s²)/N)', 'Phase (°)', 'Coherence γ²']);
  });
});
