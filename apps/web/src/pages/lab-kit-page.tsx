// Lab kit: the instance's inventory of hammers (with their tips), accelerometers (per-axis
// sensitivities) and conditioners, with calibration history and who books each item when.
// Admins and campaign leads keep it; everyone signed in reads it. Campaigns borrow from it in Kit.
import { useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { accelerometerUnits, hammerUnits, labCalibrationCreateSchema, labItemCreateSchema, type LabKind } from '@resonote/contracts';
import { api } from '../lib/api.ts';
import { issuesToErrors, numberOrUndefined, splitList, type FieldErrors } from '../lib/forms.ts';
import { labKeys, useLabItems, type LabItem } from '../lib/lab-data.ts';
import { useFailure } from '../lib/mutation.ts';
import { useToast } from '../lib/toast.tsx';
import { Button, Field, Notice, Panel, Spinner } from '../components/ui.tsx';
import { Select } from '../components/form-controls.tsx';
import { CalibrationForm, CalibrationHistory, CalibrationState } from '../components/kit/calibration-parts.tsx';
import { FormActions } from '../components/form-parts.tsx';

const KIND_TITLE: Record<LabKind, string> = { hammer: 'Hammers', accelerometer: 'Accelerometers', conditioner: 'Conditioners' };
const sig = (v: number) => Number(v.toPrecision(4)).toString();
const AXES = ['X', 'Y', 'Z'] as const;

function Sensitivity({ item }: { item: LabItem }) {
  if (item.kind === 'conditioner' || item.sensitivity === null) return <span className="text-[var(--muted)]">no sensitivity (part of the chain)</span>;
  const perAxis = AXES.filter((a) => item.axisSensitivities[a] !== undefined);
  return (
    <span className="num">
      {sig(item.sensitivity)} {item.sensitivityUnit}
      {item.sensitivityUnit !== item.sensitivityBaseUnit && item.sensitivityBase !== null && <span className="text-[var(--muted)]"> = {sig(item.sensitivityBase)} {item.sensitivityBaseUnit}</span>}
      {perAxis.length > 0 && (
        <span className="block text-xs text-[var(--muted)]">
          {perAxis.map((a) => `${a} ${sig(item.axisSensitivities[a]!)}`).join(' · ')} {item.sensitivityBaseUnit}
        </span>
      )}
    </span>
  );
}

function ItemRow({ item, canEdit }: { item: LabItem; canEdit: boolean }) {
  const [calibrating, setCalibrating] = useState(false);
  const [history, setHistory] = useState(false);
  const client = useQueryClient();
  const today = new Date().toISOString().slice(0, 10);
  const current = item.bookings.filter((b) => b.toOn >= today);
  return (
    <li className="space-y-2 border-b border-[var(--line)] py-3 last:border-0" data-testid="lab-item" data-serial={item.serial}>
      <div className="grid items-start gap-x-6 gap-y-2 sm:grid-cols-2 xl:grid-cols-[minmax(14rem,1.3fr)_minmax(11rem,1fr)_minmax(11rem,auto)_minmax(13rem,1.3fr)_auto]">
        <div className="min-w-0">
          <p className="font-medium">
            {item.model} <span className="num text-[var(--muted)]">SN {item.serial}</span>
          </p>
          <p className="text-xs text-[var(--muted)]">{item.kind === 'hammer' ? `Tips: ${item.tips.join(', ') || 'none registered'}` : item.kind === 'accelerometer' ? `Axes: ${item.axes.join(', ')}` : item.notes || 'Signal conditioner'}</p>
        </div>
        <div className="min-w-0 text-sm">
          <Sensitivity item={item} />
        </div>
        <CalibrationState calibration={item.calibration} />
        <div className="min-w-0 text-xs" data-testid="lab-bookings">
          {current.length === 0 ? (
            <span className="text-[var(--muted)]">Not booked</span>
          ) : (
            <ul>
              {current.map((b) => (
                <li key={b.id}>
                  <span className="num">
                    {b.fromOn} → {b.toOn}
                  </span>{' '}
                  {b.campaignName ?? <span className="text-[var(--muted)]">{b.otherCampaign}</span>}
                  {b.bookedByName ? ` (${b.bookedByName})` : ''}
                </li>
              ))}
            </ul>
          )}
        </div>
        <div className="flex flex-wrap justify-end gap-2 sm:col-span-2 xl:col-span-1">
          <Button variant="ghost" onClick={() => setHistory((h) => !h)} aria-expanded={history} className="min-h-9 px-3 text-xs">
            History <span className="num">({item.calibrations.length})</span>
          </Button>
          {canEdit && !calibrating && (
            <Button variant="secondary" onClick={() => setCalibrating(true)} className="min-h-9 px-3 text-xs" data-testid="lab-calibrate">
              Record calibration
            </Button>
          )}
        </div>
      </div>
      {history && <CalibrationHistory calibrations={item.calibrations} sensitivity={(c) => [c.sensitivity !== null ? `${sig(c.sensitivity)} ${c.sensitivityUnit}` : '', ...Object.entries(c.axisSensitivities).map(([a, v]) => `${a} ${sig(v)} ${item.sensitivityBaseUnit}`)].filter(Boolean).join(' ')} />}
      {calibrating && (
        <CalibrationForm
          item={item}
          path={`/lab/items/${item.id}/calibrations`}
          schema={labCalibrationCreateSchema}
          refresh={() => client.invalidateQueries({ queryKey: labKeys.items })}
          staleKeys={[labKeys.items]}
          onClose={() => setCalibrating(false)}
          sensitivity={item.kind !== 'conditioner'}
          axes={item.kind === 'accelerometer' && item.axes.length > 1 ? item.axes : []}
          sensitivityHint="Optional; updates the item and the campaigns booking it."
          testId="lab-calibration-save"
        />
      )}
    </li>
  );
}

function AddItemForm({ onClose }: { onClose: () => void }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [kind, setKind] = useState<LabKind>('hammer');
  const [axes, setAxes] = useState<('X' | 'Y' | 'Z')[]>(['Z']);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const common = { kind, model: String(f.get('model') ?? ''), serial: String(f.get('serial') ?? ''), notes: String(f.get('notes') ?? '') };
    const perAxis: Record<string, number | undefined> = {};
    for (const a of axes.length > 1 ? axes : []) {
      const v = String(f.get(`axis-${a}`) ?? '').trim();
      if (v) perAxis[a] = numberOrUndefined(v);
    }
    const values =
      kind === 'conditioner'
        ? common
        : kind === 'hammer'
          ? { ...common, sensitivity: numberOrUndefined(f.get('sensitivity')), sensitivityUnit: String(f.get('sensitivityUnit')), tips: splitList(String(f.get('tips') ?? '').replace(/;/g, ',')) }
          : { ...common, sensitivity: numberOrUndefined(f.get('sensitivity')), sensitivityUnit: String(f.get('sensitivityUnit')), axes: AXES.filter((a) => axes.includes(a)), axisSensitivities: perAxis };
    const parsed = labItemCreateSchema.safeParse(values);
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    try {
      await api('/lab/items', { body: parsed.data });
      await client.invalidateQueries({ queryKey: labKeys.items });
      toast('ok', `${common.model} (SN ${common.serial}) added to the lab kit.`);
      onClose();
    } catch (err) {
      fail(err);
    } finally {
      setBusy(false);
    }
  }
  const units = kind === 'hammer' ? hammerUnits : accelerometerUnits;
  return (
    <form onSubmit={submit} noValidate className="mb-4 grid gap-3 rounded-md border border-[var(--line)] p-3 sm:grid-cols-2 lg:grid-cols-3" aria-label="Add to the lab kit">
      <Select id="lab-kind" label="Kind" value={kind} onChange={(e) => setKind(e.target.value as LabKind)} options={[['hammer', 'Hammer'], ['accelerometer', 'Accelerometer'], ['conditioner', 'Conditioner']]} />
      <Field id="lab-model" name="model" label="Model" error={errors.model} />
      <Field id="lab-serial" name="serial" label="Serial number" error={errors.serial} />
      {kind !== 'conditioner' && (
        <>
          <Field id="lab-sens" name="sensitivity" inputMode="decimal" label="Sensitivity" error={errors.sensitivity} />
          <Select key={kind} id="lab-unit" name="sensitivityUnit" label="Unit" options={units.map((u) => [u, u])} error={errors.sensitivityUnit} />
        </>
      )}
      {kind === 'hammer' && <Field id="lab-tips" name="tips" label="Tips" placeholder="rubber, plastic, steel" hint="Separate tips with commas." error={errors.tips} />}
      {kind === 'accelerometer' && (
        <fieldset className="flex flex-col gap-1">
          <legend className="text-sm font-medium">Axes</legend>
          <div className="flex gap-3 pt-1">
            {AXES.map((a) => (
              <label key={a} className="inline-flex items-center gap-1 text-sm">
                <input type="checkbox" checked={axes.includes(a)} onChange={() => setAxes((l) => (l.includes(a) ? l.filter((x) => x !== a) : [...l, a]))} /> {a}
              </label>
            ))}
          </div>
          {errors.axes && <p className="text-xs text-bad">{errors.axes}</p>}
        </fieldset>
      )}
      {kind === 'accelerometer' && axes.length > 1 && AXES.filter((a) => axes.includes(a)).map((a) => <Field key={a} id={`lab-axis-${a}`} name={`axis-${a}`} inputMode="decimal" label={`Axis ${a} sensitivity`} hint="Optional, in the unit above; else the one sensitivity." error={errors[`axisSensitivities.${a}`]} />)}
      <Field id="lab-notes" name="notes" label="Notes" error={errors.notes} />
      <FormActions busy={busy} submit="Add to the lab kit" onCancel={onClose} testId="lab-add-save" />
    </form>
  );
}

export function LabKitPage() {
  const items = useLabItems();
  const [adding, setAdding] = useState(false);
  const canEdit = items.data?.canEdit ?? false;
  return (
    <div className="space-y-4" data-testid="lab-kit-page">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-xl font-semibold">Lab kit</h1>
          <p className="text-sm text-[var(--muted)]">The lab’s hammers, accelerometers and conditioners with their calibrations. A campaign borrows an item by booking it in its Kit.{canEdit ? '' : ' Admins and campaign leads keep this list.'}</p>
        </div>
        {canEdit && !adding && (
          <Button onClick={() => setAdding(true)} data-testid="lab-add">
            Add item
          </Button>
        )}
      </div>
      {adding && <AddItemForm onClose={() => setAdding(false)} />}
      {items.isPending && <Spinner label="Loading the lab kit…" />}
      {items.isError && <Notice tone="error">The lab kit could not be loaded: {items.error.message}</Notice>}
      {items.data && items.data.items.length === 0 && <Notice tone="info">The lab kit is empty. {canEdit ? 'Add the first hammer or accelerometer above.' : 'An admin or a campaign lead adds items.'}</Notice>}
      {items.data &&
        (['hammer', 'accelerometer', 'conditioner'] as const).map((kind) => {
          const list = items.data.items.filter((i) => i.kind === kind);
          if (!list.length) return null;
          return (
            <Panel key={kind} title={<>{KIND_TITLE[kind]} <span className="num font-normal text-[var(--muted)]">({list.length})</span></>}>
              <ul>
                {list.map((i) => (
                  <ItemRow key={i.id} item={i} canEdit={canEdit} />
                ))}
              </ul>
            </Panel>
          );
        })}
    </div>
  );
}
