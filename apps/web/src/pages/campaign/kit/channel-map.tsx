// The channel map: which sensor (and axis) is on which acquisition channel, the DOF it measures
// and its sign. Leads add, edit and remove rows.
import { useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { channelCreateSchema, channelPatchSchema, kitModelName } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import { keys, type Channel, type KitItem } from '../../../lib/campaign-data.ts';
import { issuesToErrors, numberOrUndefined, type FieldErrors } from '../../../lib/forms.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Panel } from '../../../components/ui.tsx';
import { DataTable } from '../../../components/data-table.tsx';
import { RowFormCell } from '../../../components/form-parts.tsx';

const cell = 'min-h-9 w-full min-w-0 rounded border border-[var(--line)] bg-[var(--panel)] px-2 text-sm outline-none focus:border-accent aria-invalid:border-bad';

export function ChannelMap({ campaignId, channels, items, canLead }: { campaignId: string; channels: Channel[]; items: KitItem[]; canLead: boolean }) {
  const [editing, setEditing] = useState<string | null>(null);
  const [adding, setAdding] = useState(false);
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const usable = items.filter((i) => !i.retired);

  async function remove(c: Channel) {
    if (!window.confirm(`Remove channel ${c.channel} from the channel map?`)) return;
    try {
      await api(`/campaigns/${campaignId}/channels/${c.id}`, { method: 'DELETE' });
      await client.invalidateQueries({ queryKey: keys.channels(campaignId) });
      toast('ok', `Channel ${c.channel} removed.`);
    } catch (err) {
      fail(err, [keys.channels(campaignId)]);
    }
  }

  return (
    <Panel
      title="Channel map"
      actions={
        canLead &&
        !adding && (
          <Button variant="secondary" onClick={() => setAdding(true)} disabled={usable.length === 0} title={usable.length === 0 ? 'Register a sensor first' : undefined}>
            Add channel
          </Button>
        )
      }
    >
      {channels.length === 0 && !adding && (
        <p className="py-3 text-sm text-[var(--muted)]" data-testid="channels-empty">
          No channels mapped.{canLead ? (usable.length ? ' Add one row per acquisition channel: the hammer, then each accelerometer axis.' : ' Register the hammer and the accelerometers first.') : ''}
        </p>
      )}
      {(channels.length > 0 || adding) && (
        <DataTable
          frame="-mx-4 overflow-x-auto px-4"
          table="w-full min-w-[640px] text-sm"
          head="text-left text-xs text-[var(--muted)]"
          th="py-2 pr-2 font-medium"
          columns={['Channel', 'Sensor', 'Axis', 'DOF', 'Sign', 'Label', 'Sensitivity', ...(canLead ? [{ label: <span className="sr-only">Actions</span>, className: '' }] : [])]}
        >
              {channels.map((c) =>
                editing === c.id ? (
                  <ChannelForm key={c.id} campaignId={campaignId} items={usable} channel={c} onClose={() => setEditing(null)} />
                ) : (
                  <tr key={c.id} className="border-t border-[var(--line)]">
                    <td className="num py-1.5 pr-2 font-medium">{c.channel}</td>
                    <td className="pr-2">
                      {c.model} <span className="num text-xs text-[var(--muted)]">SN {c.serial}</span>
                      {c.retired && <span className="ml-1 text-xs text-warn">(retired)</span>}
                    </td>
                    <td className="num pr-2">{c.axis ?? '—'}</td>
                    <td className="num pr-2">{c.dof ?? <span className="font-sans text-xs text-[var(--muted)]">follows the schedule</span>}</td>
                    <td className="num pr-2">{c.sign === 1 ? '+1' : '−1'}</td>
                    <td className="pr-2">{c.label || '—'}</td>
                    <td className="num pr-2 text-xs whitespace-nowrap">
                      {c.sensitivityBase.toPrecision(4)} {c.sensitivityBaseUnit}
                    </td>
                    {canLead && (
                      <td className="text-right whitespace-nowrap">
                        <Button variant="ghost" className="min-h-9 px-2" onClick={() => setEditing(c.id)} aria-label={`Edit channel ${c.channel}`}>
                          Edit
                        </Button>
                        <Button variant="ghost" className="min-h-9 px-2 text-bad" onClick={() => void remove(c)} aria-label={`Remove channel ${c.channel}`}>
                          Remove
                        </Button>
                      </td>
                    )}
                  </tr>
                ),
              )}
              {adding && <ChannelForm campaignId={campaignId} items={usable} nextNumber={Math.max(0, ...channels.map((c) => c.channel)) + 1} onClose={() => setAdding(false)} />}
        </DataTable>
      )}
    </Panel>
  );
}

function ChannelForm({ campaignId, items, channel, nextNumber, onClose }: { campaignId: string; items: KitItem[]; channel?: Channel; nextNumber?: number; onClose: () => void }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [itemId, setItemId] = useState(channel?.kitItemId ?? items[0]?.id ?? '');
  const item = items.find((i) => i.id === itemId);
  const form = `channel-${channel?.id ?? 'new'}`;

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const axis = String(f.get('axis') ?? '');
    const dof = String(f.get('dof') ?? '').trim();
    const values = { kitItemId: itemId, axis: axis || null, dof: dof || null, sign: Number(f.get('sign')), label: String(f.get('label') ?? '') };
    const parsed = channel ? channelPatchSchema.safeParse({ version: channel.version, ...values }) : channelCreateSchema.safeParse({ channel: numberOrUndefined(f.get('channel')), ...values });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    try {
      await api(`/campaigns/${campaignId}/channels${channel ? `/${channel.id}` : ''}`, { method: channel ? 'PATCH' : 'POST', body: parsed.data });
      await client.invalidateQueries({ queryKey: keys.channels(campaignId) });
      toast('ok', `Channel ${channel?.channel ?? (parsed.data as { channel: number }).channel} saved.`);
      onClose();
    } catch (err) {
      fail(err, [keys.channels(campaignId)]);
    }
  }
  const err = (k: string) => errors[k] && <p className="text-xs text-bad">{errors[k]}</p>;
  return (
    <tr className="border-t border-[var(--line)] bg-accent-soft/30 align-top">
      <td className="py-1 pr-2">
        {channel ? (
          <span className="num font-medium">{channel.channel}</span>
        ) : (
          <input form={form} name="channel" aria-label="Channel number" defaultValue={nextNumber} inputMode="numeric" className={`${cell} num w-16`} />
        )}
        {err('channel')}
      </td>
      <td className="py-1 pr-2">
        <select form={form} aria-label="Sensor" value={itemId} onChange={(e) => setItemId(e.target.value)} className={cell}>
          {items.map((i) => (
            <option key={i.id} value={i.id}>
              {kitModelName(i.kind, i.model)} SN {i.serial}
            </option>
          ))}
        </select>
        {err('kitItemId')}
      </td>
      <td className="py-1 pr-2">
        <select form={form} name="axis" aria-label="Axis" defaultValue={channel?.axis ?? ''} className={`${cell} num`} disabled={item?.kind === 'hammer'}>
          <option value="">{item?.kind === 'hammer' ? '—' : item && item.axes.length === 1 ? `${item.axes[0]} (only)` : 'choose'}</option>
          {item?.kind === 'accelerometer' &&
            item.axes.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
        </select>
        {err('axis')}
      </td>
      <td className="py-1 pr-2">
        <input form={form} name="dof" aria-label="DOF" placeholder="B21:+Z" defaultValue={channel?.dof ?? ''} className={`${cell} num`} />
        {err('dof')}
      </td>
      <td className="py-1 pr-2">
        <select form={form} name="sign" aria-label="Sign" defaultValue={String(channel?.sign ?? 1)} className={`${cell} num`}>
          <option value="1">+1</option>
          <option value="-1">−1</option>
        </select>
      </td>
      <td className="py-1 pr-2">
        <input form={form} name="label" aria-label="Label" defaultValue={channel?.label ?? ''} className={cell} />
        {err('label')}
      </td>
      <td className="py-1 pr-2 text-xs text-[var(--muted)]">Leave the DOF empty when the sensor roves.</td>
      <RowFormCell id={form} onSubmit={submit} onCancel={onClose} />
    </tr>
  );
}
