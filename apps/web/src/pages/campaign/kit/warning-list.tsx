// Calibration warnings of the kit (overdue, due soon, none), each with an icon and the state in words.
import type { KitAnswer } from '../../../lib/campaign-data.ts';

const look = {
  overdue: { glyph: '✕', cls: 'text-bad', word: 'Overdue' },
  'due-soon': { glyph: '!', cls: 'text-warn', word: 'Due soon' },
  none: { glyph: '–', cls: 'text-[var(--muted)]', word: 'No record' },
  ok: { glyph: '✓', cls: 'text-ok', word: 'OK' },
} as const;

export function WarningList({ warnings }: { warnings: KitAnswer['warnings'] }) {
  return (
    <section aria-label="Calibration warnings" className="rounded-lg border border-warn/50 bg-warn/5 px-4 py-3" data-testid="calibration-warnings">
      <h2 className="mb-1 text-sm font-semibold">Calibration warnings</h2>
      <ul className="space-y-1 text-sm">
        {warnings.map((w) => (
          <li key={w.kitItemId} className="flex gap-2">
            <span aria-hidden className={`w-4 shrink-0 text-center font-bold ${look[w.state].cls}`}>
              {look[w.state].glyph}
            </span>
            <span>
              <span className={`font-medium ${look[w.state].cls}`}>{look[w.state].word}:</span> {w.message}
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}
