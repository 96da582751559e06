// Runs a modal fit off the API's event loop: CMIF, then the LSCF stabilization diagram over the
// requested model orders (packages/dsp/src/modal). Reports progress to the parent thread.
import { parentPort } from 'node:worker_threads';
import { cmif, cmifPeaksWithoutColumn, stabilizationDiagram, suggestModes, type FrfSet } from '@resonote/dsp';
import type { FitJob, FitMessage } from './fit-types.ts';

function post(message: FitMessage) {
  parentPort!.postMessage(message);
}

parentPort!.on('message', (job: FitJob) => {
  try {
    const set: FrfSet = {
      f: new Float64Array(job.f),
      kind: job.kind,
      frfs: job.frfs.map((x) => ({ response: x.response, reference: x.reference, h: { re: new Float64Array(x.re), im: new Float64Array(x.im) } })),
    };
    post({ type: 'progress', progress: 0.05, message: 'mode indicator (CMIF)' });
    const indicator = cmif(set);
    const [lo, hi] = job.bandHz;
    const keep: number[] = [];
    for (let k = 0; k < indicator.f.length; k++) if (indicator.f[k]! >= lo && indicator.f[k]! <= hi) keep.push(k);
    const cmifOut = { f: keep.map((k) => indicator.f[k]!), values: indicator.values.map((v) => keep.map((k) => v[k]!)) };
    post({ type: 'progress', progress: 0.15, message: `stabilization diagram, orders ${job.orders[0]}–${job.orders.at(-1)}` });
    const diagram = stabilizationDiagram(set, { bandHz: job.bandHz, orders: job.orders, tolerances: job.tolerances });
    const orders = diagram.orders.map((o) => ({
      order: o.order,
      // The shape estimate of each pole is kept for the suggestion, which clusters by frequency and MAC.
      poles: o.poles.map((p) => ({ fHz: p.fHz, zeta: p.zeta, stable: p.stable, lambda: p.lambda, shape: { re: Array.from(p.shape.re), im: Array.from(p.shape.im) }, participation: { re: Array.from(p.participation.re), im: Array.from(p.participation.im) } })),
    }));
    // Quality: CMIF peaks with no suggested mode (stable column) near them.
    const columns = suggestModes(diagram).map((m) => m.frequencyHz);
    const missing = cmifPeaksWithoutColumn(indicator, columns, { bandHz: job.bandHz }).map((p) => p.fHz);
    post({
      type: 'done',
      result: {
        cmif: cmifOut,
        diagram: { bandHz: diagram.bandHz, dtS: diagram.dtS, lines: diagram.lines, responses: diagram.responses, references: diagram.references, transposed: diagram.transposed, orders },
        cmifPeaksWithoutColumn: missing,
      },
    });
  } catch (err) {
    post({ type: 'failed', message: err instanceof RangeError ? err.message : `the fit failed: ${(err as Error).message}` });
  }
});
