// What a campaign's Kit and the Lab kit show and ask alike for one hammer or accelerometer: its
// calibration state with the due date, the table of its calibration records, and the form that
// records a calibration (the fields of `calibrationFields` in packages/contracts/src/kit.ts; the
// lab's adds per-axis sensitivities).
import { useState, type FormEvent } from 'react';
import type { QueryKey } from '@tanstack/react-query';
import type { ZodType } from 'zod';
import { api } from '../../lib/api.ts';
import type { CalibrationStateName } from '../../lib/campaign-data.ts';
import { issuesToErrors, numberOrUndefined, type FieldErrors } from '../../lib/forms.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { Field } from '../ui.tsx';
import { CalibrationBadge } from '../status.tsx';
import { FormActions } from '../form-parts.tsx';
import { DataTable } from '../data-table.tsx';
import { useLargeChangeConfirm } from './large-change-dialog.tsx';

/** The badge (valid, due soon, overdue, unknown) with the due date under it. */
export function CalibrationState({ calibration, align = 'start' }: { calibration: { state: CalibrationStateName; days: number | null; dueOn: string | null }; align?: 'start' | 'end' }) {
  return (
    <div className={`flex min-w-0 flex-col gap-1 ${align === 'end' ? 'items-end' : 'items-start'}`}>
      <CalibrationBadge state={calibration.state} days={calibration.days} />
      {calibration.dueOn && <span className="num text-xs text-[var(--muted)]">due {calibration.dueOn}</span>}
    </div>
  );
}

interface CalibrationRow {
  id: string;
  calibratedOn: string;
  dueOn: string;
  certificateRef: string;
  performedBy: string;
}

/** An item's calibration records, newest first as the API sends them; `sensitivity` writes that cell. */
export function CalibrationHistory<C extends CalibrationRow>({ calibrations, sensitivity }: { calibrations: readonly C[]; sensitivity: (c: C) => string }) {
  if (calibrations.length === 0) return <p className="text-sm text-[var(--muted)]">No calibration recorded yet.</p>;
  return (
    <DataTable table="w-full text-xs" th="py-1 pr-3 font-medium" columns={['Calibrated', 'Due', 'Certificate', 'By', { label: 'Sensitivity', className: 'py-1 pr-3 text-right font-medium' }]}>
          {calibrations.map((c) => (
            <tr key={c.id} className="border-t border-[var(--line)]">
              <td className="num py-1 pr-3">{c.calibratedOn}</td>
              <td className="num py-1 pr-3">{c.dueOn}</td>
              <td className="py-1 pr-3">{c.certificateRef}</td>
              <td className="py-1 pr-3">{c.performedBy}</td>
              <td className="num py-1 pr-3 text-right">{sensitivity(c) || '—'}</td>
            </tr>
          ))}
    </DataTable>
  );
}

/**
 * Records a calibration of `item` at `path` (POST), validated first with `schema` (the campaign's
 * `calibrationCreateSchema` or the lab's `labCalibrationCreateSchema`). A stated sensitivity far
 * from the current one asks first (useLargeChangeConfirm).
 */
export function CalibrationForm({
  item,
  path,
  schema,
  refresh,
  staleKeys,
  onClose,
  sensitivity = true,
  axes = [],
  sensitivityHint,
  testId,
}: {
  item: { id: string; model: string; serial: string; sensitivityUnit: string | null };
  path: string;
  schema: ZodType<{ dueOn: string }>;
  refresh: () => Promise<unknown>;
  staleKeys: QueryKey[];
  onClose: () => void;
  /** False for an item without a sensitivity of its own (a conditioner). */
  sensitivity?: boolean;
  /** Axes with a sensitivity of their own (an accelerometer with more than one axis). */
  axes?: readonly string[];
  sensitivityHint: string;
  testId?: string;
}) {
  const toast = useToast();
  const fail = useFailure();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const { withConfirmation, dialog } = useLargeChangeConfirm();
  const id = (n: string) => `${item.id}-cal-${n}`;

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const s = String(f.get('sensitivity') ?? '').trim();
    const perAxis: Record<string, number | undefined> = {};
    for (const a of axes) {
      const v = String(f.get(`axis-${a}`) ?? '').trim();
      if (v) perAxis[a] = numberOrUndefined(v);
    }
    const parsed = schema.safeParse({
      calibratedOn: String(f.get('calibratedOn') ?? ''),
      dueOn: String(f.get('dueOn') ?? ''),
      certificateRef: String(f.get('certificateRef') ?? ''),
      performedBy: String(f.get('performedBy') ?? ''),
      ...(s ? { sensitivity: numberOrUndefined(s) } : {}),
      ...(Object.keys(perAxis).length ? { axisSensitivities: perAxis } : {}),
    });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    try {
      const body = parsed.data;
      const stored = await withConfirmation(`${item.model} (SN ${item.serial})`, (confirm) => api(path, { body: confirm ? { ...body, confirmLargeChange: true } : body }));
      if (!stored) return;
      await refresh();
      toast('ok', `Calibration of ${item.model} (SN ${item.serial}) recorded, due ${body.dueOn}.`);
      onClose();
    } catch (err) {
      fail(err, staleKeys);
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} noValidate className="mt-2 grid gap-3 rounded-md border border-[var(--line)] p-3 sm:grid-cols-2 lg:grid-cols-3" aria-label={`Record a calibration of ${item.model}`}>
      <Field id={id('on')} name="calibratedOn" type="date" label="Calibrated on" error={errors.calibratedOn} />
      <Field id={id('due')} name="dueOn" type="date" label="Due on" error={errors.dueOn} />
      <Field id={id('cert')} name="certificateRef" label="Certificate reference" error={errors.certificateRef} />
      <Field id={id('by')} name="performedBy" label="Calibrated by (lab or person)" error={errors.performedBy} />
      {sensitivity && item.sensitivityUnit && <Field id={id('sens')} name="sensitivity" inputMode="decimal" label={`Stated sensitivity (${item.sensitivityUnit})`} hint={sensitivityHint} error={errors.sensitivity} />}
      {axes.map((a) => (
        <Field key={a} id={id(`axis-${a}`)} name={`axis-${a}`} inputMode="decimal" label={`Axis ${a} (${item.sensitivityUnit})`} hint="Optional." error={errors[`axisSensitivities.${a}`]} />
      ))}
      {dialog}
      <FormActions busy={busy} submit="Save calibration" onCancel={onClose} testId={testId} />
    </form>
  );
}
