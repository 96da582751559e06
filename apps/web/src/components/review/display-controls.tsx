// How FRFs are shown on Review: view, FRF kind, dB or linear magnitude, wrapped or unwrapped phase, log or linear frequency.
import type { ReactNode } from 'react';
import type { FrfView } from '../../lib/frf-figure.ts';
import { frfKindLabel, frfUnit, type FrfKind } from '../../lib/frf-math.ts';
import type { FrfDisplay } from '../tap/frf-panel.tsx';

function Segmented<T extends string>({ label, value, options, onChange, testId }: { label: string; value: T; options: [T, ReactNode][]; onChange: (v: T) => void; testId: string }) {
  return (
    <div className="flex flex-col gap-1">
      <span className="text-xs font-medium text-[var(--muted)]">{label}</span>
      <div role="radiogroup" aria-label={label} className="inline-flex rounded-md border border-[var(--line)] bg-[var(--surface)] p-0.5" data-testid={testId}>
        {options.map(([v, text]) => (
          <button
            key={v}
            type="button"
            role="radio"
            aria-checked={value === v}
            onClick={() => onChange(v)}
            className={`min-h-9 rounded px-2.5 text-sm whitespace-nowrap ${value === v ? 'bg-[var(--panel)] font-semibold text-accent-strong shadow-sm' : 'text-[var(--muted)] hover:text-[var(--ink)]'}`}
          >
            {text}
          </button>
        ))}
      </div>
    </div>
  );
}

export function DisplayControls({ value, onChange }: { value: FrfDisplay; onChange: (v: FrfDisplay) => void }) {
  const views: [FrfView, string][] = [
    ['magphase', 'Magnitude / phase'],
    ['reim', 'Real / imaginary'],
    ['nyquist', 'Nyquist'],
  ];
  return (
    <div className="flex flex-wrap items-end gap-x-4 gap-y-2" data-testid="display-controls">
      <Segmented label="View" value={value.view} options={views} onChange={(view) => onChange({ ...value, view })} testId="view-choice" />
      <div className="flex flex-col gap-1">
        <label htmlFor="frf-kind" className="text-xs font-medium text-[var(--muted)]">
          FRF kind
        </label>
        <select id="frf-kind" value={value.kind} onChange={(e) => onChange({ ...value, kind: e.target.value as FrfKind })} className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm">
          {(Object.keys(frfUnit) as FrfKind[]).map((k) => (
            <option key={k} value={k}>
              {frfKindLabel[k]}, {frfUnit[k]}
            </option>
          ))}
        </select>
      </div>
      {value.view === 'magphase' && (
        <Segmented
          label="Magnitude"
          value={value.db ? 'db' : 'lin'}
          options={[
            ['db', 'dB'],
            ['lin', 'Linear'],
          ]}
          onChange={(v) => onChange({ ...value, db: v === 'db' })}
          testId="magnitude-choice"
        />
      )}
      {value.view === 'magphase' && (
        <Segmented
          label="Phase"
          value={value.unwrap ? 'unwrapped' : 'wrapped'}
          options={[
            ['wrapped', '±180°'],
            ['unwrapped', 'Unwrapped'],
          ]}
          onChange={(v) => onChange({ ...value, unwrap: v === 'unwrapped' })}
          testId="phase-choice"
        />
      )}
      {value.view !== 'nyquist' && (
        <Segmented
          label="Frequency axis"
          value={value.logF ? 'log' : 'lin'}
          options={[
            ['lin', 'Linear'],
            ['log', 'Log'],
          ]}
          onChange={(v) => onChange({ ...value, logF: v === 'log' })}
          testId="frequency-choice"
        />
      )}
    </div>
  );
}
