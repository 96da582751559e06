// Shapes an entry's averaged spectra as JSON: frequency in Hz, complex H1/H2 per response
// channel in the requested FRF kind, coherence, the force ESD, and units.
import { convertFrf, type Complex } from '@resonote/dsp';
import { frfUnits, type FrfKind } from '@resonote/contracts';
import type { EntryResult } from './entry-result.ts';

export { frfUnits, type FrfKind };

function pick(values: Float64Array, from: number, to: number): number[] {
  // A counted loop, not Array.from(subarray): the iterator would allocate a result object per line.
  const out = new Array<number>(to - from);
  for (let k = from; k < to; k++) out[k - from] = values[k]!;
  return out;
}

function rounded(c: Complex, from: number, to: number) {
  return { re: pick(c.re, from, to), im: pick(c.im, from, to) };
}

/** `only`: the index of the single response channel to include (the others are left out). */
export function frfJson(result: EntryResult, kind: FrfKind, band: { low: number; high: number } | null, only?: number) {
  const { f } = result.frf;
  let from = 0;
  let to = f.length;
  if (band) {
    while (from < f.length && f[from]! < band.low) from++;
    to = from;
    while (to < f.length && f[to]! <= band.high) to++;
  }
  return {
    kind,
    unit: frfUnits[kind],
    estimators: 'H1 = Gfx/Gff, H2 = Gxx/Gxf; Gfx = mean(conj(F)·X) over accepted hits (Bendat & Piersol 2010)',
    averages: result.averages,
    settingsVersion: result.settingsVersion,
    inputHash: result.inputHash,
    hitIds: result.hitIds,
    excluded: result.excluded,
    computedAt: result.computedAt,
    sampleRateHz: result.sampleRateHz,
    samples: result.samples,
    df: result.sampleRateHz / result.samples,
    f: pick(f, from, to),
    excitationDof: result.excitationDof,
    forceEsd: { unit: 'N²·s/Hz', scaling: 'single-sided energy spectral density, averaged per hit', values: pick(result.frf.gff, from, to) },
    channelCount: result.channels.length,
    channels: result.channels.flatMap((c, i) => {
      if (only !== undefined && i !== only) return [];
      const h1 = kind === 'accelerance' ? result.frf.h1[i]! : convertFrf(result.frf.h1[i]!, f, 'accelerance', kind);
      const h2 = kind === 'accelerance' ? result.frf.h2[i]! : convertFrf(result.frf.h2[i]!, f, 'accelerance', kind);
      return [{ channelIndex: i, responseDof: c.dof, meanCoherence: c.meanCoherence, h1: rounded(h1, from, to), h2: rounded(h2, from, to), coherence: pick(result.frf.coherence[i]!, from, to) }];
    }),
  };
}
