// The campaign's mode table: natural frequency, damping after the exponential-window correction and
// as estimated before it, MPC, where each mode came from (fit band, model order), whether its shape is
// mass-normalised, and a flag when the same mode is in the table twice. Leads can remove a row.
import { fmtHz, fmtPct, type TableRow } from '../../lib/modes-data.ts';

export function ModeTable({ modes, selected, onSelect, onRemove, busy }: { modes: TableRow[]; selected?: number; onSelect?: (mode: number) => void; onRemove?: (row: TableRow) => void; busy?: boolean }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="mode-table">
        <thead className="text-left text-xs text-[var(--muted)]">
          <tr className="border-b border-[var(--line)]">
            <th scope="col" className="py-1.5 pr-3 font-medium">Mode</th>
            <th scope="col" className="pr-3 text-right font-medium">f (Hz)</th>
            <th scope="col" className="pr-3 text-right font-medium">
              ζ (% of critical)
              <span className="block font-normal">window-corrected</span>
            </th>
            <th scope="col" className="pr-3 text-right font-medium">
              ζ raw (%)
              <span className="block font-normal">as estimated</span>
            </th>
            <th scope="col" className="pr-3 text-right font-medium">
              MPC (0–1)
              <span className="block font-normal">1 = real shape</span>
            </th>
            <th scope="col" className="pr-3 font-medium">
              From fit
              <span className="block font-normal">band, model order</span>
            </th>
            <th scope="col" className="pr-3 font-medium">Unit modal mass</th>
            {onRemove && <th scope="col" className="sr-only">Remove</th>}
          </tr>
        </thead>
        <tbody>
          {modes.map((m) => (
            <tr
              key={m.id}
              data-mode={m.mode}
              data-fhz={m.fHz}
              data-zeta={m.zetaPercent}
              data-duplicate={m.duplicate ? 'yes' : 'no'}
              className={`border-b border-[var(--line)] last:border-0 ${selected === m.mode ? 'bg-accent-soft' : ''} ${onSelect ? 'cursor-pointer hover:bg-accent-soft/60' : ''}`}
              onClick={onSelect ? () => onSelect(m.mode) : undefined}
              aria-selected={selected === m.mode ? true : undefined}
            >
              <th scope="row" className="num py-1.5 pr-3 text-left align-top font-medium">
                {selected === m.mode && <span aria-hidden className="mr-1 text-accent">▸</span>}
                {m.mode}
              </th>
              <td className="num pr-3 text-right align-top">
                {fmtHz(m.fHz)} Hz
                {m.duplicate && (
                  <span className="mt-0.5 block text-left text-xs font-normal text-warn" data-testid="duplicate-flag" title={m.duplicate.note}>
                    <span aria-hidden>⚠ </span>found twice: same as mode {m.duplicate.of ?? '?'}
                  </span>
                )}
              </td>
              <td className="num pr-3 text-right align-top">{fmtPct(m.zetaPercent)} %</td>
              <td className="num pr-3 text-right align-top text-[var(--muted)]">{fmtPct(m.estimated.zetaPercent)} %</td>
              <td className="num pr-3 text-right align-top">
                {m.mpc.toFixed(3)}
                {m.mpc < 0.9 && (
                  <span className="ml-1 text-warn" title="MPC below 0.9 (common practice): a complex shape; check for a close mode or noise">
                    ! <span className="sr-only">complex shape</span>
                  </span>
                )}
              </td>
              <td className="num pr-3 align-top text-xs text-[var(--muted)]">
                <span className="whitespace-nowrap">{m.source.bandHz[0]}–{m.source.bandHz[1]} Hz</span> <span className="whitespace-nowrap">order {m.source.order}</span>
              </td>
              <td className="pr-3 align-top text-xs" title={m.massNote}>
                {m.massShape ? (
                  <span>
                    <span aria-hidden className="text-ok">✓ </span>yes
                  </span>
                ) : (
                  <span className="text-[var(--muted)]">no driving point</span>
                )}
              </td>
              {onRemove && (
                <td className="text-right align-top">
                  <button
                    type="button"
                    disabled={busy}
                    className="inline-flex min-h-8 min-w-8 items-center justify-center rounded-md text-[var(--muted)] hover:bg-accent-soft hover:text-bad disabled:opacity-50"
                    aria-label={`Remove mode ${m.mode} at ${fmtHz(m.fHz)} Hz from the table`}
                    onClick={(ev) => {
                      ev.stopPropagation();
                      onRemove(m);
                    }}
                  >
                    ✕
                  </button>
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
