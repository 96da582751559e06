// Tap: an overdue or missing calibration of a channel's sensor, said before the first hit. With
// the lead's policy at "block" the API refuses hits until it is fixed; at "warn" they go through.
import { useState } from 'react';
import { Link } from 'react-router';
import { useReadiness } from '../../lib/lab-data.ts';

export function CalibrationBanner({ campaignId }: { campaignId: string }) {
  const readiness = useReadiness(campaignId);
  const [open, setOpen] = useState(false);
  const r = readiness.data;
  if (!r || r.problems.length === 0) return null;
  const blocking = r.blocking;
  const n = r.problems.length;
  return (
    <div role={blocking ? 'alert' : 'status'} className={`rounded-md border px-3 py-2 text-sm ${blocking ? 'border-bad/50 bg-bad/8 text-bad' : 'border-warn/60 bg-warn/8 text-[var(--ink)]'}`} data-testid="calibration-banner" data-policy={r.policy.calibration}>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <span aria-hidden className={`font-bold ${blocking ? '' : 'text-warn'}`}>
          {blocking ? '✕' : '!'}
        </span>
        <span className="font-semibold">{blocking ? 'Hits are blocked: calibration overdue or missing' : 'Calibration overdue or missing'}</span>
        <span>
          {n === 1 ? r.problems[0] : `${n} channels: ${r.channels.filter((c) => c.problem).map((c) => c.channel).join(', ')}.`}
        </span>
        {n > 1 && (
          <button type="button" className="underline" onClick={() => setOpen((o) => !o)} aria-expanded={open}>
            {open ? 'Hide details' : 'Details'}
          </button>
        )}
        <Link to="../kit" className="underline">
          Kit
        </Link>
      </div>
      {open && (
        <ul className="mt-1 list-disc pl-6 text-xs">
          {r.problems.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      )}
      <p className="mt-0.5 text-xs opacity-90">
        {blocking
          ? 'The lead set this campaign to refuse hits until the certificates are recorded in Kit.'
          : 'Hits are taken (the lead’s setting is “warn”); their FRFs rest on a sensitivity that is not in date.'}
      </p>
    </div>
  );
}
