// The mode table: natural frequency, damping after the exponential-window correction and as
// estimated before it, and the modal phase collinearity of each shape.
import { fmtHz, fmtPct, type ModeRow } from '../../lib/modes-data.ts';

export function ModeTable({ modes, correction, selected, onSelect }: { modes: ModeRow[]; correction?: string; selected?: number; onSelect?: (mode: number) => void }) {
  return (
    <div className="space-y-2">
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
                ζ estimated (%)
                <span className="block font-normal">before correction</span>
              </th>
              <th scope="col" className="text-right font-medium">
                MPC (0–1)
                <span className="block font-normal">1 = real shape</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {modes.map((m) => (
              <tr
                key={m.mode}
                data-mode={m.mode}
                data-fhz={m.fHz}
                data-zeta={m.zetaPercent}
                className={`border-b border-[var(--line)] last:border-0 ${selected === m.mode ? 'bg-accent-soft' : ''} ${onSelect ? 'cursor-pointer hover:bg-accent-soft/60' : ''}`}
                onClick={onSelect ? () => onSelect(m.mode) : undefined}
                aria-selected={selected === m.mode ? true : undefined}
              >
                <th scope="row" className="num py-1.5 pr-3 text-left font-medium">
                  {selected === m.mode && <span aria-hidden className="mr-1 text-accent">▸</span>}
                  {m.mode}
                </th>
                <td className="num pr-3 text-right">{fmtHz(m.fHz)} Hz</td>
                <td className="num pr-3 text-right">{fmtPct(m.zetaPercent)} %</td>
                <td className="num pr-3 text-right text-[var(--muted)]">{fmtPct(m.estimated.zetaPercent)} %</td>
                <td className="num text-right">
                  {m.mpc.toFixed(3)}
                  {m.mpc < 0.8 && (
                    <span className="ml-1 text-warn" title="A complex shape: check for close modes or noise">
                      ! <span className="sr-only">complex shape</span>
                    </span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {correction && (
        <p className="text-xs text-[var(--muted)]" data-testid="damping-correction">
          Damping correction: {correction}
        </p>
      )}
    </div>
  );
}
