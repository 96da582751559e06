// The poles chosen from the stabilization diagram, sorted by frequency, with their frequency
// and damping; leads can remove each, add every fully stable pole at one order, and compute shapes.
import { useMemo, useState } from 'react';
import { fmtHz, fmtPct, stabilityLook, type DiagramOrder, type PoleRef } from '../../lib/modes-data.ts';
import { Button } from '../ui.tsx';

export function ChosenPoles({ orders, chosen, canEdit, busy, onRemove, onAddStable, onSuggest, onClear, onCompute }: { orders: DiagramOrder[]; chosen: PoleRef[]; canEdit: boolean; busy: boolean; onRemove: (p: PoleRef) => void; onAddStable: (order: number) => void; onSuggest: () => void; onClear: () => void; onCompute: () => void }) {
  const rows = useMemo(
    () =>
      chosen
        .map((p) => ({ ref: p, pole: orders.find((o) => o.order === p.order)?.poles[p.index] }))
        .filter((r): r is { ref: PoleRef; pole: NonNullable<typeof r.pole> } => Boolean(r.pole))
        .sort((a, b) => a.pole.fHz - b.pole.fHz),
    [chosen, orders],
  );
  const withStable = orders.filter((o) => o.poles.some((p) => p.stable === 'all'));
  const [order, setOrder] = useState<number | null>(null);
  const helperOrder = order ?? withStable.at(-1)?.order ?? null;

  return (
    <div className="space-y-3">
      {rows.length === 0 && <p className="text-sm text-[var(--muted)]">{canEdit ? 'No poles chosen yet. Click poles in the diagram (fully stable ones are filled diamonds), or add the stable poles of one order below.' : 'No poles chosen yet.'}</p>}
      {rows.length > 0 && (
        <table className="w-full text-sm" data-testid="chosen-poles">
          <thead className="text-left text-xs text-[var(--muted)]">
            <tr>
              <th scope="col" className="py-1 font-medium">f (Hz)</th>
              <th scope="col" className="text-right font-medium">ζ (%)</th>
              <th scope="col" className="text-right font-medium">Order</th>
              {canEdit && <th scope="col" className="sr-only">Remove</th>}
            </tr>
          </thead>
          <tbody>
            {rows.map(({ ref, pole }) => (
              <tr key={`${ref.order}-${ref.index}`} className="border-t border-[var(--line)]" data-pole-fhz={pole.fHz}>
                <td className="num py-1">
                  <span aria-hidden className="mr-1 text-[var(--muted)]">
                    {stabilityLook[pole.stable].glyph}
                  </span>
                  {fmtHz(pole.fHz)} Hz
                </td>
                <td className="num text-right">{fmtPct(pole.zeta * 100)} %</td>
                <td className="num text-right">{ref.order}</td>
                {canEdit && (
                  <td className="text-right">
                    <button type="button" className="inline-flex min-h-8 min-w-8 items-center justify-center rounded-md text-[var(--muted)] hover:bg-accent-soft hover:text-bad" aria-label={`Remove the pole at ${fmtHz(pole.fHz)} Hz`} onClick={() => onRemove(ref)}>
                      ✕
                    </button>
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canEdit && (
        <>
          {withStable.length > 0 && (
            <div className="space-y-1">
              <Button type="button" variant="secondary" className="w-full" onClick={onSuggest} data-testid="suggest-modes">
                Suggest modes from the whole diagram
              </Button>
              <p className="text-xs text-[var(--muted)]">Computed on the server: fully stable poles that come back at 40 % or more of the orders, within 1 % in frequency and with agreeing shapes (MAC ≥ 0.9), count as one mode, so close modes with different shapes stay apart. Check the suggestion on the diagram.</p>
            </div>
          )}
          {withStable.length > 0 && helperOrder !== null && (
            <div className="flex flex-wrap items-end gap-2">
              <label className="flex flex-col gap-1 text-xs text-[var(--muted)]" htmlFor="stable-order">
                Order
                <select id="stable-order" className="num min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm text-[var(--ink)]" value={helperOrder} onChange={(e) => setOrder(Number(e.target.value))}>
                  {withStable.map((o) => (
                    <option key={o.order} value={o.order}>
                      {o.order}
                    </option>
                  ))}
                </select>
              </label>
              <Button type="button" variant="secondary" className="flex-1" onClick={() => onAddStable(helperOrder)}>
                Choose the stable poles at order {helperOrder}
              </Button>
            </div>
          )}
          <div className="flex gap-2">
            <Button type="button" className="flex-1" disabled={rows.length === 0 || busy} onClick={onCompute}>
              {busy ? 'Computing shapes…' : 'Compute shapes'}
            </Button>
            {rows.length > 0 && (
              <Button type="button" variant="ghost" onClick={onClear}>
                Clear
              </Button>
            )}
          </div>
        </>
      )}
    </div>
  );
}
