// A measured FRF against a synthesized one, in the requested kind: from the modes chosen in one fit
// (with its residual terms, over its band), or from every row of the campaign's mode table (no
// residual terms, over the whole band its fits cover).
import { z } from 'zod';
import { convertFrf, synthesize, type Complex } from '@resonote/dsp';
import { canonicalLabel, frfKindSchema, frfUnits as units } from '@resonote/contracts';
import type { Db } from '@resonote/db/client';
import { conflict, notFound } from '../errors.ts';
import { frfSetFor, type FitRow } from './frf-set.ts';
import { loadModel, type StoredModel } from './model-store.ts';
import { synthesizeFromTable, tableRows } from './mode-table.ts';

/** The FRF kind asked for in a query (accelerance by default). */
export const frfKindQuery = frfKindSchema.default('accelerance');
export const synthesisQuerySchema = z.strictObject({ response: z.string().min(3).max(80), reference: z.string().min(3).max(80), kind: frfKindQuery });
type SynthesisQuery = z.infer<typeof synthesisQuerySchema>;

export async function fitSynthesis(db: Db, fit: FitRow, access: { campaignId: string }, query: SynthesisQuery) {
  const modes = fit.modes as { model: StoredModel } | null;
  if (!modes) throw conflict('No modes have been chosen from this fit yet.');
  const request = fit.request as { entryIds: string[]; bandHz: [number, number] };
  const { set } = await frfSetFor(db, access.campaignId, request.entryIds);
  const measured = set.frfs.find((x) => x.response === query.response && x.reference === query.reference);
  if (!measured) throw notFound(`The FRF ${query.response} / ${query.reference}`);
  const model = loadModel(modes.model);
  const syn = synthesize(model, set.f, query.response, query.reference, query.kind);
  const meas = query.kind === 'accelerance' ? measured.h : convertFrf(measured.h, set.f, 'accelerance', query.kind);
  const ks = Array.from(set.f).map((x, k) => [x, k] as const).filter(([x]) => x >= request.bandHz[0] && x <= request.bandHz[1]).map(([, k]) => k);
  const pick = (c: Complex) => ({ re: ks.map((k) => c.re[k]!), im: ks.map((k) => c.im[k]!) });
  return { kind: query.kind, unit: units[query.kind], f: ks.map((k) => set.f[k]!), measured: pick(meas), synthesized: pick(syn) };
}

export async function tableSynthesis(db: Db, access: { campaignId: string }, query: SynthesisQuery) {
  const rows = await tableRows(db, access.campaignId);
  if (rows.length === 0) throw conflict("The campaign's mode table is empty: add modes from a fit first.");
  const { set } = await frfSetFor(db, access.campaignId, undefined, true);
  const response = canonicalLabel(query.response);
  const reference = canonicalLabel(query.reference);
  const measured = set.frfs.find((x) => x.response === response && x.reference === reference);
  if (!measured) throw notFound(`The FRF ${query.response} / ${query.reference}`);
  const lo = Math.min(...rows.map((r) => r.bandLowHz));
  const hi = Math.max(...rows.map((r) => r.bandHighHz));
  const ks = Array.from(set.f).map((x, k) => [x, k] as const).filter(([x]) => x >= lo && x <= hi && x > 0).map(([, k]) => k);
  const f = Float64Array.from(ks, (k) => set.f[k]!);
  const syn = synthesizeFromTable(rows, f, response, reference, query.kind);
  const meas = query.kind === 'accelerance' ? measured.h : convertFrf(measured.h, set.f, 'accelerance', query.kind);
  const number = new Map(rows.map((r, i) => [r.id, i + 1]));
  return {
    kind: query.kind,
    unit: units[query.kind],
    bandHz: [lo, hi],
    f: Array.from(f),
    measured: { re: ks.map((k) => meas.re[k]!), im: ks.map((k) => meas.im[k]!) },
    synthesized: { re: Array.from(syn.h.re), im: Array.from(syn.h.im) },
    modesUsed: syn.used.map((id) => number.get(id)),
    modesWithoutThisFrf: syn.missing.map((id) => number.get(id)),
    note: 'Sum of the table’s modes without residual terms (those belong to one fitted band); modes marked as found twice are left out. Each FRF is on the positive axis of both points.',
  };
}
