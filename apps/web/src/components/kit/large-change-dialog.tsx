// Asks before storing a sensitivity that differs from the previous one by more than the
// tolerance: both values in both units (mV/N and mV/lbf, or mV/(m/s²) and mV/g), the change in
// per cent, and two plain choices. The API refuses such a change without confirmLargeChange.
import { useCallback, useEffect, useState, type ReactNode } from 'react';
import type { SensitivityChange } from '@resonote/contracts';
import { ApiError } from '../../lib/api.ts';
import { Button } from '../ui.tsx';

const fmt = (v: number) => Number(v.toPrecision(5)).toString();

function ChangeDialog({ name, change, onAnswer }: { name: string; change: SensitivityChange; onAnswer: (confirmed: boolean) => void }) {
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && onAnswer(false);
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onAnswer]);
  const row = (label: string, values: SensitivityChange['previous'], strong = false) => (
    <tr className={strong ? 'font-semibold' : ''}>
      <th scope="row" className="py-1 pr-4 text-left font-medium">
        {label}
      </th>
      {values.map((v) => (
        <td key={v.unit} className="num py-1 pr-4 text-right">
          {fmt(v.value)} {v.unit}
        </td>
      ))}
    </tr>
  );
  return (
    <div className="fixed inset-0 z-50 flex items-center justify-center bg-black/40 p-4">
      <div role="alertdialog" aria-modal="true" aria-labelledby="large-change-title" aria-describedby="large-change-text" className="w-full max-w-lg space-y-3 rounded-lg border border-[var(--line)] bg-[var(--panel)] p-5 shadow-xl" data-testid="large-change-dialog">
        <h2 id="large-change-title" className="text-base font-semibold">
          <span aria-hidden>⚠ </span>Sensitivity changes by <span className="num">{change.changePct.toFixed(1)} %</span>
        </h2>
        <p id="large-change-text" className="text-sm">
          The new sensitivity of {name} differs from the previous one by more than the tolerance of <span className="num">{fmt(change.tolerancePct)} %</span>. A step this large is more often a unit mix-up (mV/N against mV/lbf, mV/(m/s²) against mV/g) than a real change of the sensor.
        </p>
        <table className="w-full text-sm">
          <tbody>
            {row('Previous', change.previous)}
            {row('New', change.next, true)}
          </tbody>
        </table>
        <p className="text-xs text-[var(--muted)]">1 lbf = 4.4482216152605 N and g = 9.80665 m/s², both exact by definition (NIST SP 811, 2008).</p>
        <div className="flex flex-wrap justify-end gap-2 pt-1">
          <Button autoFocus variant="secondary" onClick={() => onAnswer(false)} data-testid="large-change-back">
            Go back and correct
          </Button>
          <Button onClick={() => onAnswer(true)} data-testid="large-change-confirm">
            Store the new value
          </Button>
        </div>
      </div>
    </div>
  );
}

/**
 * `send(confirm)` runs the request; when the API answers large-sensitivity-change, the dialog asks
 * and, on "Store", sends again with confirmLargeChange: true. Resolves false when the user backs off.
 */
export function useLargeChangeConfirm(): { withConfirmation: (name: string, send: (confirm: boolean) => Promise<unknown>) => Promise<boolean>; dialog: ReactNode } {
  const [asking, setAsking] = useState<{ name: string; change: SensitivityChange; resolve: (v: boolean) => void } | null>(null);
  const withConfirmation = useCallback(async (name: string, send: (confirm: boolean) => Promise<unknown>) => {
    try {
      await send(false);
      return true;
    } catch (err) {
      if (!(err instanceof ApiError) || err.code !== 'large-sensitivity-change') throw err;
      const confirmed = await new Promise<boolean>((resolve) => setAsking({ name, change: err.details as SensitivityChange, resolve }));
      setAsking(null);
      if (!confirmed) return false;
      await send(true);
      return true;
    }
  }, []);
  const dialog = asking ? <ChangeDialog name={asking.name} change={asking.change} onAnswer={asking.resolve} /> : null;
  return { withConfirmation, dialog };
}
