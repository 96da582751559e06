// Hammers and accelerometers: sensitivity in the unit entered and in base units, tips or axes,
// mass, calibration state and records. Leads add, edit, retire and record calibrations.
import { useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { accelerometerUnits, calibrationCreateSchema, hammerUnits, kitItemCreateSchema, kitItemPatchSchema } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import { keys, type KitItem } from '../../../lib/campaign-data.ts';
import { issuesToErrors, numberOrUndefined, type FieldErrors } from '../../../lib/forms.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Field, Panel } from '../../../components/ui.tsx';
import { Chips, NumberField, Select } from '../../../components/form-controls.tsx';
import { CalibrationForm, CalibrationHistory, CalibrationState } from '../../../components/kit/calibration-parts.tsx';
import { FormActions } from '../../../components/form-parts.tsx';
import { useLargeChangeConfirm } from '../../../components/kit/large-change-dialog.tsx';

type Kind = KitItem['kind'];
const axesAll = ['X', 'Y', 'Z'] as const;
const sig = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(1) : Math.abs(v) >= 10 ? v.toFixed(2) : v.toFixed(3)).replace(/\.?0+$/, '');

function useRefreshKit(campaignId: string) {
  const client = useQueryClient();
  return () => Promise.all([client.invalidateQueries({ queryKey: keys.kit(campaignId) }), client.invalidateQueries({ queryKey: keys.channels(campaignId) })]);
}

export function KitItems({ campaignId, items, canLead }: { campaignId: string; items: KitItem[]; canLead: boolean }) {
  const [adding, setAdding] = useState<Kind | null>(null);
  const group = (kind: Kind, title: string) => {
    const list = items.filter((i) => i.kind === kind);
    return (
      <Panel
        title={
          <>
            {title} <span className="num font-normal text-[var(--muted)]">({list.length})</span>
          </>
        }
        actions={
          canLead &&
          adding !== kind && (
            <Button variant="secondary" onClick={() => setAdding(kind)}>
              {kind === 'hammer' ? 'Add hammer' : 'Add accelerometer'}
            </Button>
          )
        }
      >
        {adding === kind && <ItemForm campaignId={campaignId} kind={kind} onClose={() => setAdding(null)} />}
        {list.length === 0 && adding !== kind && (
          <p className="py-3 text-sm text-[var(--muted)]">
            {kind === 'hammer' ? 'No hammer registered. Register it with its sensitivity (mV/N) and tips.' : 'No accelerometer registered. Register each with its sensitivity (mV/(m/s²) or mV/g) and axes.'}
          </p>
        )}
        <ul className="divide-y divide-[var(--line)]">
          {list.map((item) => (
            <ItemRow key={item.id} campaignId={campaignId} item={item} canLead={canLead} />
          ))}
        </ul>
      </Panel>
    );
  };
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {group('hammer', 'Hammers')}
      {group('accelerometer', 'Accelerometers')}
    </div>
  );
}

function ItemRow({ campaignId, item, canLead }: { campaignId: string; item: KitItem; canLead: boolean }) {
  const [mode, setMode] = useState<'view' | 'edit' | 'calibrate'>('view');
  const [open, setOpen] = useState(false);
  const refresh = useRefreshKit(campaignId);
  const toast = useToast();
  const fail = useFailure();
  const converted = item.sensitivityUnit !== item.sensitivityBaseUnit;

  async function setRetired(retired: boolean) {
    try {
      await api(`/campaigns/${campaignId}/kit/${item.id}`, { method: 'PATCH', body: { version: item.version, retired } });
      await refresh();
      toast('ok', `${item.model} (SN ${item.serial}) ${retired ? 'retired' : 'back in use'}.`);
    } catch (err) {
      fail(err, [keys.kit(campaignId)]);
    }
  }

  return (
    <li className={`py-3 ${item.retired ? 'opacity-70' : ''}`} data-kit-item={item.serial}>
      {mode === 'edit' ? (
        <ItemForm campaignId={campaignId} kind={item.kind} item={item} onClose={() => setMode('view')} />
      ) : (
        <>
          <div className="flex flex-wrap items-start justify-between gap-2">
            <div className="min-w-0">
              <div className="font-medium">
                {item.model} <span className="num text-sm font-normal text-[var(--muted)]">SN {item.serial}</span>
                {item.retired && (
                  <span className="ml-2 text-xs text-[var(--muted)]">
                    <span aria-hidden>⊘</span> Retired
                  </span>
                )}
              </div>
              <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
                <dt className="text-[var(--muted)]">Sensitivity</dt>
                <dd className="num">
                  {sig(item.sensitivity)} {item.sensitivityUnit}
                  {converted && (
                    <span className="text-[var(--muted)]">
                      {' '}
                      = {sig(item.sensitivityBase)} {item.sensitivityBaseUnit}
                    </span>
                  )}
                </dd>
                <dt className="text-[var(--muted)]">{item.kind === 'hammer' ? 'Tips' : 'Axes'}</dt>
                <dd className="num">{item.kind === 'hammer' ? item.tips.join(', ') || '—' : item.axes.join(' ')}</dd>
                <dt className="text-[var(--muted)]">Mass</dt>
                <dd className="num">{item.massG === null ? '—' : `${item.massG} g`}</dd>
              </dl>
            </div>
            <CalibrationState calibration={item.calibration} align="end" />
          </div>
          <div className="mt-2 flex flex-wrap gap-1">
            <Button variant="ghost" className="min-h-9 px-2" onClick={() => setOpen((o) => !o)} aria-expanded={open}>
              {open ? 'Hide' : 'Show'} calibrations ({item.calibrations.length})
            </Button>
            {canLead && (
              <>
                <Button variant="ghost" className="min-h-9 px-2" onClick={() => setMode('edit')}>
                  Edit
                </Button>
                <Button variant="ghost" className="min-h-9 px-2" onClick={() => setMode(mode === 'calibrate' ? 'view' : 'calibrate')}>
                  Add calibration
                </Button>
                <Button variant="ghost" className="min-h-9 px-2" onClick={() => void setRetired(!item.retired)}>
                  {item.retired ? 'Bring back' : 'Retire'}
                </Button>
              </>
            )}
          </div>
          {mode === 'calibrate' && (
            <CalibrationForm
              item={item}
              path={`/campaigns/${campaignId}/kit/${item.id}/calibrations`}
              schema={calibrationCreateSchema}
              refresh={refresh}
              staleKeys={[keys.kit(campaignId)]}
              onClose={() => setMode('view')}
              sensitivityHint="Optional; updates the item when given."
            />
          )}
          {open && (
            <div className="mt-2">
              <CalibrationHistory calibrations={item.calibrations} sensitivity={(c) => (c.sensitivity === null ? '' : `${sig(c.sensitivity)} ${c.sensitivityUnit}`)} />
            </div>
          )}
        </>
      )}
    </li>
  );
}

function ItemForm({ campaignId, kind, item, onClose }: { campaignId: string; kind: Kind; item?: KitItem; onClose: () => void }) {
  const refresh = useRefreshKit(campaignId);
  const toast = useToast();
  const fail = useFailure();
  const [axes, setAxes] = useState<('X' | 'Y' | 'Z')[]>(item?.axes ?? ['Z']);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const units = kind === 'hammer' ? hammerUnits : accelerometerUnits;
  const id = (n: string) => `${item?.id ?? `new-${kind}`}-${n}`;
  const { withConfirmation, dialog } = useLargeChangeConfirm();

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const massText = String(f.get('massG') ?? '').trim();
    const values = {
      model: String(f.get('model') ?? ''),
      serial: String(f.get('serial') ?? ''),
      sensitivity: numberOrUndefined(f.get('sensitivity')),
      sensitivityUnit: String(f.get('sensitivityUnit')),
      ...(kind === 'hammer' ? { tips: String(f.get('tips') ?? '').split(',').map((t) => t.trim()).filter(Boolean) } : { axes: axesAll.filter((a) => axes.includes(a)) }),
      massG: massText === '' ? null : numberOrUndefined(massText),
      notes: String(f.get('notes') ?? ''),
    };
    let body: Record<string, unknown>;
    if (item) {
      const changes: Record<string, unknown> = { version: item.version };
      for (const [k, v] of Object.entries(values)) if (JSON.stringify(v) !== JSON.stringify(item[k as keyof KitItem])) changes[k] = v;
      if (changes.sensitivityUnit !== undefined) changes.sensitivity = values.sensitivity;
      const parsed = kitItemPatchSchema.safeParse(changes);
      if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
      if (Object.keys(changes).length === 1) return onClose();
      body = parsed.data;
    } else {
      const parsed = kitItemCreateSchema.safeParse({ kind, ...values });
      if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
      body = parsed.data;
    }
    setErrors({});
    setBusy(true);
    try {
      const stored = await withConfirmation(`${values.model} (SN ${values.serial})`, (confirm) => api(`/campaigns/${campaignId}/kit${item ? `/${item.id}` : ''}`, { method: item ? 'PATCH' : 'POST', body: confirm ? { ...body, confirmLargeChange: true } : body }));
      if (!stored) return;
      await refresh();
      toast('ok', `${values.model} (SN ${values.serial}) ${item ? 'saved' : 'registered'}.`);
      onClose();
    } catch (err) {
      fail(err, [keys.kit(campaignId)]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate className="mb-3 space-y-3 rounded-md border border-[var(--line)] p-3" aria-label={item ? `Edit ${item.model}` : `Add ${kind}`}>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={id('model')} name="model" label="Model" defaultValue={item?.model} error={errors.model} />
        <Field id={id('serial')} name="serial" label="Serial number" defaultValue={item?.serial} error={errors.serial} />
        <NumberField id={id('sensitivity')} name="sensitivity" label="Sensitivity" defaultValue={item?.sensitivity} error={errors.sensitivity} />
        <Select id={id('unit')} name="sensitivityUnit" label="Sensitivity unit" defaultValue={item?.sensitivityUnit ?? units[0]} options={units.map((u) => [u, u])} error={errors.sensitivityUnit} />
        {kind === 'hammer' ? (
          <Field id={id('tips')} name="tips" label="Tips" defaultValue={item?.tips.join(', ')} placeholder="steel, plastic, rubber" hint="Separate tips with commas." error={errors.tips} />
        ) : (
          <div className="flex flex-col gap-1">
            <span className="text-sm font-medium">Axes</span>
            <Chips label="Axes" all={axesAll} value={axes} onToggle={(a) => setAxes((l) => (l.includes(a) ? l.filter((x) => x !== a) : [...l, a]))} />
            {errors.axes && <p className="text-xs text-bad">{errors.axes}</p>}
          </div>
        )}
        <NumberField id={id('mass')} name="massG" label="Mass" unit="g" defaultValue={item?.massG ?? ''} hint="Optional." error={errors.massG} />
      </div>
      <Field id={id('notes')} name="notes" label="Notes" defaultValue={item?.notes} error={errors.notes} />
      {dialog}
      <FormActions busy={busy} submit={item ? 'Save' : kind === 'hammer' ? 'Register hammer' : 'Register accelerometer'} onCancel={onClose} className="flex gap-2" />
    </form>
  );
}
