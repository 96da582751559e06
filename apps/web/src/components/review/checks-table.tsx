// Reciprocity (H_ij against H_ji) and linearity (one DOF pair at two force levels) from the API,
// with FRAC and the differences at the peaks. No pass/fail: the API says why.
import type { ReactNode } from 'react';
import type { ChecksAnswer, PeakDifference } from '../../lib/hits-data.ts';

function PeakCells({ p }: { p: PeakDifference | undefined }) {
  if (!p) return <td colSpan={4} className="py-1 text-xs text-[var(--muted)]">no peak in the band</td>;
  return (
    <>
      <td className="num py-1 pr-3 text-right">{p.fHz.toFixed(1)} Hz</td>
      <td className="num pr-3 text-right">{p.dbDifference >= 0 ? '+' : '−'}{Math.abs(p.dbDifference).toFixed(2)} dB</td>
      <td className="num pr-3 text-right">{p.phaseDifferenceDeg >= 0 ? '+' : '−'}{Math.abs(p.phaseDifferenceDeg).toFixed(1)}°</td>
      <td className="num pr-3 text-right">{p.peakShiftHz >= 0 ? '+' : '−'}{Math.abs(p.peakShiftHz).toFixed(2)} Hz</td>
    </>
  );
}

const peakHead = (
  <>
    <th className="pr-3 text-right font-medium">Peak</th>
    <th className="pr-3 text-right font-medium">Level difference</th>
    <th className="pr-3 text-right font-medium">Phase difference</th>
    <th className="pr-3 text-right font-medium">Peak shift</th>
  </>
);

/**
 * One table of comparisons: each row group names its FRF(s) and figures in `lead` cells (spanning
 * the group's rows), then one row per peak.
 */
function ComparisonTable<R extends { frac: number; peaks: PeakDifference[] }>({ rows, head, rowKey, lead }: { rows: readonly R[]; head: ReactNode; rowKey: (r: R) => string; lead: (r: R) => ReactNode[] }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full">
        <thead className="text-left text-xs text-[var(--muted)]">
          <tr>
            {head}
            <th className="pr-3 text-right font-medium">FRAC (0–1)</th>
            {peakHead}
          </tr>
        </thead>
        <tbody>
          {rows.flatMap((r) => {
            const span = Math.max(1, r.peaks.length);
            const cells = [...lead(r), r.frac.toFixed(3)];
            return Array.from({ length: span }, (_, i) => (
              <tr key={`${rowKey(r)}${i}`} className={i === 0 ? 'border-t border-[var(--line)]' : ''}>
                {i === 0 &&
                  cells.map((c, k) => (
                    <td key={k} rowSpan={span} className={k === 0 ? 'num py-1 pr-3 align-top text-xs' : 'num pr-3 text-right align-top whitespace-nowrap'}>
                      {c}
                    </td>
                  ))}
                <PeakCells p={r.peaks[i]} />
              </tr>
            ));
          })}
        </tbody>
      </table>
    </div>
  );
}

export function ChecksTables({ checks }: { checks: ChecksAnswer }) {
  return (
    <div className="space-y-5 text-sm" data-testid="checks">
      <p className="rounded-md border border-[var(--line)] bg-[var(--surface)] px-3 py-2 text-xs" data-testid="checks-note">
        <span aria-hidden className="mr-1 font-bold">i</span>
        {checks.note}
      </p>
      <section data-testid="reciprocity-checks">
        <h3 className="mb-1 font-semibold">Reciprocity: H(i, j) against H(j, i)</h3>
        {checks.reciprocity.length === 0 ? (
          <p className="text-[var(--muted)]">No pair of DOFs has been measured both ways yet, so there is nothing to compare. Reciprocity needs H(i, j) and H(j, i), e.g. a second reference DOF.</p>
        ) : (
          <ComparisonTable
            rows={checks.reciprocity}
            head={<th className="py-1 pr-3 font-medium">H(i, j) / H(j, i), response / excitation</th>}
            rowKey={(r) => `${r.a.response}${r.a.excitation}`}
            lead={(r) => [
              <>
                {r.a.response} / {r.a.excitation}
                <br />
                {r.b.response} / {r.b.excitation}
              </>,
            ]}
          />
        )}
      </section>
      <section data-testid="linearity-checks">
        <h3 className="mb-1 font-semibold">Linearity: the same DOF pair at a low and a high force</h3>
        {checks.linearity.length === 0 ? (
          <p className="text-[var(--muted)]">No DOF has enough accepted hits at two clearly different force levels (at least 4 hits, the higher half at 1.5 × the force of the lower half or more).</p>
        ) : (
          <ComparisonTable
            rows={checks.linearity}
            head={
              <>
                <th className="py-1 pr-3 font-medium">Response / excitation</th>
                <th className="pr-3 text-right font-medium">Force low / high</th>
                <th className="pr-3 text-right font-medium">Force ratio</th>
              </>
            }
            rowKey={(r) => `${r.entry.response}${r.entry.excitation}`}
            lead={(r) => [`${r.entry.response} / ${r.entry.excitation}`, `${r.lowForceN.toFixed(0)} N / ${r.highForceN.toFixed(0)} N`, `${r.forceRatio.toFixed(2)} ×`]}
          />
        )}
        <p className="mt-1 text-xs text-[var(--muted)]">Differences are the high-force FRF against the low-force one (linearity) or H(i, j) against H(j, i) (reciprocity), at the largest peaks in the band; phase wrapped to (−180°, 180°].</p>
      </section>
    </div>
  );
}
