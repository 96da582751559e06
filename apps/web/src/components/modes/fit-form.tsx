// What a lead sets before a fit: which FRFs (by DOF; default the current plan's FRFs with accepted
// hits, flagged ones left out — contracts' defaultFitSelection, the same rule as the API), the band in
// Hz and the highest model order. Only leads see it.
import { useMemo, useState } from 'react';
import { defaultFitSelection, leftOutSummary } from '@resonote/contracts';
import type { ScheduleEntry } from '../../lib/campaign-data.ts';
import { Button } from '../ui.tsx';
import { NumberField } from '../form-controls.tsx';

export interface FitRequest {
  entryIds?: string[];
  bandHz: { low: number; high: number };
  maxOrder: number;
  orderStep: number;
}

export function FitForm({ entries, campaign, defaultBand, busy, onRun }: { entries: ScheduleEntry[]; campaign: { testType: 'roving-hammer' | 'roving-response'; referenceDofs: string[] }; defaultBand?: { low: number; high: number }; busy: boolean; onRun: (req: FitRequest) => void }) {
  const rovingSide = campaign.testType === 'roving-response' ? 'response' : 'excitation';
  const measured = useMemo(() => entries.filter((e) => e.acceptedHits > 0), [entries]);
  const selection = useMemo(() => defaultFitSelection(measured, campaign), [measured, campaign]);
  const [picked, setPicked] = useState<Set<string> | null>(null); // null: the default selection
  const [low, setLow] = useState(defaultBand ? String(defaultBand.low) : '');
  const [high, setHigh] = useState(defaultBand ? String(defaultBand.high) : '');
  const [maxOrder, setMaxOrder] = useState('30');
  const [orderStep, setOrderStep] = useState('2');
  const [open, setOpen] = useState(false);

  const chosen = picked ?? new Set(selection.chosen);
  const label = (e: ScheduleEntry) => (rovingSide === 'response' ? e.responseDof : e.excitationDof);
  const toggle = (id: string) => {
    const next = new Set(chosen);
    if (next.has(id)) next.delete(id);
    else next.add(id);
    setPicked(next.size === selection.chosen.length && selection.chosen.every((x) => next.has(x)) ? null : next);
  };

  const lowN = Number(low);
  const highN = Number(high);
  const orderN = Number(maxOrder);
  const stepN = Number(orderStep);
  const errors = {
    low: low.trim() === '' || !Number.isFinite(lowN) || lowN < 0 ? 'a frequency of 0 Hz or more' : undefined,
    high: high.trim() === '' || !Number.isFinite(highN) || highN <= lowN ? 'above the lower edge' : undefined,
    order: !Number.isInteger(orderN) || orderN < 2 || orderN > 160 ? 'a whole number from 2 to 160' : undefined,
    step: !Number.isInteger(stepN) || stepN < 1 || stepN > 10 ? 'a whole number from 1 to 10' : undefined,
    frfs: chosen.size < 2 ? 'pick at least 2 FRFs' : undefined,
  };
  const valid = !Object.values(errors).some(Boolean);

  return (
    <form
      className="space-y-3"
      aria-label="Modal fit settings"
      onSubmit={(ev) => {
        ev.preventDefault();
        if (!valid) return;
        onRun({ entryIds: picked ? measured.filter((e) => picked.has(e.id)).map((e) => e.id) : undefined, bandHz: { low: lowN, high: highN }, maxOrder: orderN, orderStep: stepN });
      }}
    >
      <div>
        <button type="button" className="flex w-full min-h-10 items-center justify-between gap-2 rounded-md border border-[var(--line)] px-3 text-left text-sm hover:border-accent" aria-expanded={open} aria-controls="fit-frfs" onClick={() => setOpen((o) => !o)}>
          <span>
            FRFs: <span className="num font-medium">{picked || selection.leftOut.length ? `${chosen.size} of ${measured.length}` : `all ${measured.length}`}</span> with accepted hits
          </span>
          <span aria-hidden className="text-[var(--muted)]">{open ? '▴' : '▾'}</span>
        </button>
        {errors.frfs && <p className="mt-1 text-xs text-bad">Choose at least 2 FRFs.</p>}
        {!picked && selection.leftOut.length > 0 && (
          <p className="mt-1 text-xs text-[var(--muted)]" data-testid="fit-left-out">
            Left out: {leftOutSummary(selection.leftOut, campaign.testType)}. Pick {selection.leftOut.length === 1 ? 'it' : 'them'} in the list to include {selection.leftOut.length === 1 ? 'it' : 'them'}.
          </p>
        )}
        {open && (
          <div id="fit-frfs" className="mt-2 space-y-2 rounded-md border border-[var(--line)] p-2">
            <div className="flex gap-2 text-xs">
              <button type="button" className="text-accent hover:underline" onClick={() => setPicked(null)}>
                Default
              </button>
              {selection.leftOut.length > 0 && (
                <button type="button" className="text-accent hover:underline" onClick={() => setPicked(new Set(measured.map((e) => e.id)))}>
                  All
                </button>
              )}
              <button type="button" className="text-accent hover:underline" onClick={() => setPicked(new Set())}>
                None
              </button>
              <span className="text-[var(--muted)]">by {rovingSide === 'response' ? 'response' : 'excitation'} DOF</span>
            </div>
            {measured.length === 0 && <p className="text-xs text-[var(--muted)]">No FRF has accepted hits yet.</p>}
            <div className="flex max-h-40 flex-wrap gap-1 overflow-y-auto" role="group" aria-label="FRFs in the fit">
              {measured.map((e) => {
                const on = chosen.has(e.id);
                return (
                  <button
                    key={e.id}
                    type="button"
                    aria-pressed={on}
                    title={`${e.responseDof} / ${e.excitationDof}, ${e.acceptedHits} accepted hits${e.status === 'flagged' ? ', flagged (low coherence)' : ''}`}
                    onClick={() => toggle(e.id)}
                    className={`num inline-flex min-h-8 items-center gap-1 rounded-md border px-1.5 text-xs ${on ? 'border-accent bg-accent-soft font-semibold text-accent-strong' : 'border-[var(--line)] text-[var(--muted)]'}`}
                  >
                    <span aria-hidden>{on ? '✓' : '·'}</span>
                    {label(e)}
                    {e.status === 'flagged' && <span className="text-warn" title="flagged: low coherence">⚑<span className="sr-only"> flagged</span></span>}
                  </button>
                );
              })}
            </div>
          </div>
        )}
      </div>
      <div className="grid grid-cols-2 gap-3">
        <NumberField id="fit-low" label="Band from" unit="Hz" value={low} onChange={(e) => setLow(e.target.value)} error={errors.low && `Enter ${errors.low}.`} />
        <NumberField id="fit-high" label="Band to" unit="Hz" value={high} onChange={(e) => setHigh(e.target.value)} error={errors.high && `Enter a frequency ${errors.high}.`} />
        <NumberField id="fit-order" label="Max model order" value={maxOrder} onChange={(e) => setMaxOrder(e.target.value)} error={errors.order && `Enter ${errors.order}.`} />
        <NumberField id="fit-step" label="Order step" value={orderStep} onChange={(e) => setOrderStep(e.target.value)} error={errors.step && `Enter ${errors.step}.`} />
      </div>
      <Button type="submit" disabled={!valid || busy} className="w-full">
        {busy ? 'Fit running…' : 'Run fit'}
      </Button>
      <p className="text-xs text-[var(--muted)]">Stable means within 1 % in frequency, 5 % in damping and MAC above 98 % against the previous order.</p>
    </form>
  );
}
