// Geometry: the points (mm) with their measured directions, edited in place by leads, and the
// lines between them.
import { useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { directions, lineCreateSchema, pointCreateSchema, pointPatchSchema, type Direction } from '@resonote/contracts';
import { api, ApiError } from '../../../lib/api.ts';
import { keys, type GeometryLine, type GeometryPoint } from '../../../lib/campaign-data.ts';
import { issuesToErrors, numberOrUndefined, type FieldErrors } from '../../../lib/forms.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Notice, Panel } from '../../../components/ui.tsx';
import { Chips } from '../../../components/form-controls.tsx';
import { RowFormCell } from '../../../components/form-parts.tsx';

const cell = 'min-h-9 w-full min-w-0 rounded border border-[var(--line)] bg-[var(--panel)] px-2 text-sm outline-none focus:border-accent aria-invalid:border-bad';
const fmt = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(3).replace(/0+$/, ''));

export function GeometryTable({ campaignId, points, lines, canLead }: { campaignId: string; points: GeometryPoint[]; lines: GeometryLine[]; canLead: boolean }) {
  const [editing, setEditing] = useState<string | null>(null);
  const [adding, setAdding] = useState(false);
  const [showRetired, setShowRetired] = useState(true);
  const shown = showRetired ? points : points.filter((p) => !p.retired);
  const retiredCount = points.filter((p) => p.retired).length;

  return (
    <Panel
      title={
        <>
          Points <span className="num font-normal text-[var(--muted)]">({points.length - retiredCount} active{retiredCount ? `, ${retiredCount} retired` : ''})</span>
        </>
      }
      actions={
        <div className="flex items-center gap-2">
          {retiredCount > 0 && (
            <label className="flex items-center gap-1 text-xs text-[var(--muted)]">
              <input type="checkbox" checked={showRetired} onChange={(e) => setShowRetired(e.target.checked)} /> Show retired
            </label>
          )}
          {canLead && !adding && (
            <Button variant="secondary" onClick={() => setAdding(true)}>
              Add point
            </Button>
          )}
        </div>
      }
    >
      {adding && <AddPointForm campaignId={campaignId} onClose={() => setAdding(false)} />}
      {points.length === 0 && !adding && (
        <p className="py-6 text-center text-sm text-[var(--muted)]" data-testid="points-empty">
          No points yet.{canLead ? ' Add them one by one, or import a CSV of label,x,y,z (mm) below.' : ' The lead adds them.'}
        </p>
      )}
      {shown.length > 0 && (
        <div className="-mx-4 max-h-[520px] overflow-auto px-4">
          <table className="w-full min-w-[600px] text-sm" data-testid="points-table">
            <thead className="sticky top-0 z-10 bg-[var(--panel)] text-left text-xs text-[var(--muted)]">
              <tr>
                <th className="py-2 pr-2 font-medium">Label</th>
                <th className="pr-2 text-right font-medium">x (mm)</th>
                <th className="pr-2 text-right font-medium">y (mm)</th>
                <th className="pr-2 text-right font-medium">z (mm)</th>
                <th className="pr-2 font-medium">Directions</th>
                <th className="pr-2 font-medium">State</th>
                {canLead && <th className="font-medium"><span className="sr-only">Actions</span></th>}
              </tr>
            </thead>
            <tbody>
              {shown.map((p) =>
                editing === p.id ? (
                  <EditPointRow key={p.id} campaignId={campaignId} point={p} onClose={() => setEditing(null)} />
                ) : (
                  <PointRow key={p.id} campaignId={campaignId} point={p} canLead={canLead} onEdit={() => setEditing(p.id)} />
                ),
              )}
            </tbody>
          </table>
        </div>
      )}
      <LinesList campaignId={campaignId} points={points} lines={lines} canLead={canLead} />
    </Panel>
  );
}

function usePointActions(campaignId: string) {
  const client = useQueryClient();
  const fail = useFailure();
  const refresh = () => Promise.all([client.invalidateQueries({ queryKey: keys.points(campaignId) }), client.invalidateQueries({ queryKey: keys.schedule(campaignId) })]);
  async function patch(point: GeometryPoint, changes: Record<string, unknown>) {
    const parsed = pointPatchSchema.safeParse({ version: point.version, ...changes });
    if (!parsed.success) return { errors: issuesToErrors(parsed.error) };
    try {
      await api(`/campaigns/${campaignId}/points/${point.id}`, { method: 'PATCH', body: parsed.data });
      await refresh();
      return { ok: true };
    } catch (err) {
      fail(err, [keys.points(campaignId)]);
      return { failed: true };
    }
  }
  return { patch, refresh, fail };
}

function PointRow({ campaignId, point, canLead, onEdit }: { campaignId: string; point: GeometryPoint; canLead: boolean; onEdit: () => void }) {
  const toast = useToast();
  const { patch, refresh, fail } = usePointActions(campaignId);
  const [busy, setBusy] = useState(false);
  const [retireOffer, setRetireOffer] = useState<string>();

  async function toggle(d: Direction) {
    setBusy(true);
    const next = point.directions.includes(d) ? point.directions.filter((x) => x !== d) : [...point.directions, d];
    const r = await patch(point, { directions: directions.filter((x) => next.includes(x)) });
    if (r.ok) toast('ok', `Point ${point.label}: directions ${next.length ? next.join(' ') : 'none'}.`);
    setBusy(false);
  }
  async function setRetired(retired: boolean) {
    setBusy(true);
    const r = await patch(point, { retired });
    if (r.ok) toast('ok', retired ? `Point ${point.label} retired; its hits stay.` : `Point ${point.label} brought back.`);
    setRetireOffer(undefined);
    setBusy(false);
  }
  async function remove() {
    if (!window.confirm(`Delete point ${point.label}? Its lines and planned schedule entries go with it.`)) return;
    setBusy(true);
    try {
      await api(`/campaigns/${campaignId}/points/${point.id}`, { method: 'DELETE' });
      await refresh();
      toast('ok', `Point ${point.label} deleted.`);
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) setRetireOffer(err.message);
      else fail(err, [keys.points(campaignId)]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <>
      <tr className={`border-t border-[var(--line)] ${point.retired ? 'text-[var(--muted)]' : ''}`} data-point={point.label}>
        <td className="num py-1.5 pr-2 font-medium">{point.label}</td>
        <td className="num pr-2 text-right">{fmt(point.x)}</td>
        <td className="num pr-2 text-right">{fmt(point.y)}</td>
        <td className="num pr-2 text-right">{fmt(point.z)}</td>
        <td className="pr-2">
          <Chips label={`Directions of ${point.label}`} all={directions} value={point.directions} onToggle={canLead && !point.retired ? toggle : undefined} disabled={busy} />
          {!canLead && point.directions.length === 0 && <span className="text-xs text-[var(--muted)]">none</span>}
        </td>
        <td className="pr-2 text-xs whitespace-nowrap">
          {point.retired ? (
            <span title="Retired: kept with its hits, left out of new schedules">
              <span aria-hidden>⊘</span> Retired
            </span>
          ) : (
            <span className="text-[var(--muted)]">Active</span>
          )}
          {point.hasHits && (
            <span className="ml-2" title="Hits were recorded at this point: it can be retired, never deleted">
              <span aria-hidden>●</span> has hits
            </span>
          )}
        </td>
        {canLead && (
          <td className="py-1 text-right whitespace-nowrap">
            {!point.retired && (
              <Button variant="ghost" className="min-h-9 px-2" onClick={onEdit} disabled={busy} aria-label={`Edit point ${point.label}`}>
                Edit
              </Button>
            )}
            {point.retired ? (
              <Button variant="ghost" className="min-h-9 px-2" onClick={() => setRetired(false)} disabled={busy}>
                Bring back
              </Button>
            ) : point.hasHits ? (
              <Button variant="ghost" className="min-h-9 px-2" onClick={() => setRetired(true)} disabled={busy}>
                Retire
              </Button>
            ) : (
              <Button variant="ghost" className="min-h-9 px-2 text-bad" onClick={remove} disabled={busy} aria-label={`Delete point ${point.label}`}>
                Delete
              </Button>
            )}
          </td>
        )}
      </tr>
      {retireOffer && (
        <tr>
          <td colSpan={7} className="pb-2">
            <Notice tone="error">
              {retireOffer}{' '}
              <Button variant="secondary" className="ml-2 min-h-8" onClick={() => setRetired(true)}>
                Retire
              </Button>
            </Notice>
          </td>
        </tr>
      )}
    </>
  );
}

function EditPointRow({ campaignId, point, onClose }: { campaignId: string; point: GeometryPoint; onClose: () => void }) {
  const toast = useToast();
  const { patch } = usePointActions(campaignId);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const form = `edit-${point.id}`;

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const wanted = { label: String(f.get('label') ?? '').trim(), x: numberOrUndefined(f.get('x')), y: numberOrUndefined(f.get('y')), z: numberOrUndefined(f.get('z')) };
    const changes: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(wanted)) if (v !== point[k as 'label']) changes[k] = v;
    if (!Object.keys(changes).length) return onClose();
    setBusy(true);
    const r = await patch(point, changes);
    setBusy(false);
    if (r.errors) return setErrors(r.errors);
    if (r.ok) {
      toast('ok', `Point ${wanted.label} saved.`);
      onClose();
    }
  }
  const input = (name: 'label' | 'x' | 'y' | 'z', align = 'text-right') => (
    <td className="py-1 pr-2 align-top">
      <input form={form} name={name} aria-label={name === 'label' ? 'Label' : `${name} (mm)`} defaultValue={name === 'label' ? point.label : fmt(point[name])} className={`${cell} num ${align}`} aria-invalid={errors[name] ? true : undefined} />
      {errors[name] && <p className="text-xs text-bad">{errors[name]}</p>}
    </td>
  );
  return (
    <tr className="border-t border-[var(--line)] bg-accent-soft/30">
      {input('label', 'text-left')}
      {input('x')}
      {input('y')}
      {input('z')}
      <td className="pr-2 text-xs text-[var(--muted)]" colSpan={2}>
        Directions: use the chips after saving.
      </td>
      <RowFormCell id={form} onSubmit={submit} busy={busy} noValidate={false} onCancel={onClose} />
    </tr>
  );
}

function AddPointForm({ campaignId, onClose }: { campaignId: string; onClose: () => void }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [dirs, setDirs] = useState<Direction[]>(['+Z']);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const el = event.currentTarget;
    const f = new FormData(el);
    const parsed = pointCreateSchema.safeParse({ label: String(f.get('label') ?? ''), x: numberOrUndefined(f.get('x')), y: numberOrUndefined(f.get('y')), z: numberOrUndefined(f.get('z')), directions: directions.filter((d) => dirs.includes(d)) });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    try {
      await api(`/campaigns/${campaignId}/points`, { body: parsed.data });
      await client.invalidateQueries({ queryKey: keys.points(campaignId) });
      toast('ok', `Point ${parsed.data.label} added.`);
      el.reset();
      (el.elements.namedItem('label') as HTMLInputElement | null)?.focus();
    } catch (err) {
      fail(err);
    } finally {
      setBusy(false);
    }
  }
  const box = (name: string, label: string, unit?: string) => (
    <div className="flex min-w-0 flex-col gap-1">
      <label htmlFor={`new-point-${name}`} className="text-xs font-medium">
        {label} {unit && <span className="num text-[var(--muted)]">({unit})</span>}
      </label>
      <input id={`new-point-${name}`} name={name} inputMode={unit ? 'decimal' : undefined} className={`${cell} num`} aria-invalid={errors[name] ? true : undefined} />
      {errors[name] && <p className="text-xs text-bad">{errors[name]}</p>}
    </div>
  );
  return (
    <form onSubmit={submit} noValidate className="mb-4 rounded-md border border-[var(--line)] p-3" aria-label="Add a point">
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {box('label', 'Label')}
        {box('x', 'x', 'mm')}
        {box('y', 'y', 'mm')}
        {box('z', 'z', 'mm')}
      </div>
      <div className="mt-3 flex flex-wrap items-center gap-3">
        <span className="text-xs font-medium">Directions</span>
        <Chips label="Directions of the new point" all={directions} value={dirs} onToggle={(d) => setDirs((list) => (list.includes(d) ? list.filter((x) => x !== d) : [...list, d]))} />
        {errors.directions && <p className="text-xs text-bad">{errors.directions}</p>}
        <div className="ml-auto flex gap-2">
          <Button type="submit" disabled={busy}>
            Save point
          </Button>
          <Button type="button" variant="ghost" onClick={onClose}>
            Close
          </Button>
        </div>
      </div>
    </form>
  );
}

function LinesList({ campaignId, points, lines, canLead }: { campaignId: string; points: GeometryPoint[]; lines: GeometryLine[]; canLead: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [error, setError] = useState<string>();
  const label = new Map(points.map((p) => [p.id, p.label]));
  const active = points.filter((p) => !p.retired);

  async function add(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const parsed = lineCreateSchema.safeParse({ pointA: f.get('pointA'), pointB: f.get('pointB') });
    if (!parsed.success) return setError(issuesToErrors(parsed.error)._ ?? 'Choose two points.');
    setError(undefined);
    try {
      await api(`/campaigns/${campaignId}/lines`, { body: parsed.data });
      await client.invalidateQueries({ queryKey: keys.points(campaignId) });
      toast('ok', `Line ${label.get(parsed.data.pointA)} — ${label.get(parsed.data.pointB)} added.`);
    } catch (err) {
      fail(err);
    }
  }
  async function remove(l: GeometryLine) {
    try {
      await api(`/campaigns/${campaignId}/lines/${l.id}`, { method: 'DELETE' });
      await client.invalidateQueries({ queryKey: keys.points(campaignId) });
      toast('ok', `Line ${label.get(l.pointA)} — ${label.get(l.pointB)} removed.`);
    } catch (err) {
      fail(err, [keys.points(campaignId)]);
    }
  }
  const select = (name: string, text: string, initial?: string) => (
    <label className="flex flex-col gap-1 text-xs font-medium">
      {text}
      <select name={name} defaultValue={initial} className={`${cell} num min-w-24`}>
        {active.map((p) => (
          <option key={p.id} value={p.id}>
            {p.label}
          </option>
        ))}
      </select>
    </label>
  );
  return (
    <div className="mt-4 border-t border-[var(--line)] pt-3">
      <h3 className="mb-2 text-sm font-semibold">
        Lines <span className="num font-normal text-[var(--muted)]">({lines.length})</span>
      </h3>
      {lines.length === 0 && <p className="text-sm text-[var(--muted)]">No lines. Lines only draw the structure; they do not change the schedule.</p>}
      {lines.length > 0 && (
        <ul className="flex flex-wrap gap-1.5">
          {lines.map((l) => (
            <li key={l.id} className="num inline-flex items-center gap-1 rounded-md border border-[var(--line)] py-0.5 pl-2 text-xs">
              {label.get(l.pointA)} — {label.get(l.pointB)}
              {canLead && (
                <button type="button" onClick={() => remove(l)} className="min-h-7 min-w-7 rounded text-[var(--muted)] hover:text-bad" aria-label={`Remove line ${label.get(l.pointA)} — ${label.get(l.pointB)}`}>
                  ×
                </button>
              )}
            </li>
          ))}
        </ul>
      )}
      {canLead && active.length >= 2 && (
        <form onSubmit={add} className="mt-3 flex flex-wrap items-end gap-2" aria-label="Add a line">
          {select('pointA', 'From', active[0]?.id)}
          {select('pointB', 'To', active[1]?.id)}
          <Button type="submit" variant="secondary" className="min-h-9">
            Add line
          </Button>
          {error && <p className="text-xs text-bad">{error}</p>}
        </form>
      )}
    </div>
  );
}
