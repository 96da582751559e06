// Input scaling of the live input (docs/methods.md#input-scaling): per channel of the channel
// map, the volts an audio-class interface gives at digital full scale, and its AC-coupling low
// cut-off. With them Tap turns samples into volts, and the kit's sensitivities turn volts into N
// and m/s². The latest calibrator checks made on Tap are listed below.
import { useState } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { inputScalingSchema } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import type { Channel } from '../../../lib/campaign-data.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Notice, Panel, Spinner } from '../../../components/ui.tsx';
import { inputScalingKey, useInputScaling } from '../../../components/tap/live-panel.tsx';
import type { Scaling } from '../../../components/tap/use-live-input.ts';

interface Check {
  id: string;
  channelNumber: number;
  referenceMs2Rms: number;
  referenceHz: number;
  measuredSensitivity: number;
  kitSensitivity: number;
  deviationPercent: number;
  deviationDb: number;
  checkedByName: string | null;
  checkedAt: string;
}

const cell = 'num min-h-9 w-24 rounded border border-[var(--line)] bg-[var(--panel)] px-2 text-sm outline-none focus:border-accent aria-invalid:border-bad';

export function InputScaling({ campaignId, channels, canLead }: { campaignId: string; channels: Channel[]; canLead: boolean }) {
  const scaling = useInputScaling(campaignId);
  const checks = useQuery({ queryKey: ['campaign', campaignId, 'sensitivity-checks'], queryFn: () => api<{ checks: Check[] }>(`/campaigns/${campaignId}/sensitivity-checks`) });
  const sorted = [...channels].sort((a, b) => a.channel - b.channel);
  return (
    <Panel title="Live input scaling">
      <p className="mb-2 text-xs text-[var(--muted)]">
        For an audio-class interface on Tap's live input: the volts at digital full scale of each channel (from the interface's data sheet or a measured reference) and its AC-coupling low cut-off. Interface input <span className="num">n</span> is channel <span className="num">n</span>.
      </p>
      {scaling.isPending && <Spinner label="Loading the input scaling…" />}
      {scaling.isError && <Notice tone="error">The input scaling could not be loaded: {scaling.error.message}</Notice>}
      {scaling.data && sorted.length === 0 && <p className="text-sm text-[var(--muted)]">No channels mapped yet.</p>}
      {scaling.data && sorted.length > 0 && (
        <table className="w-full text-sm" data-testid="input-scaling">
          <thead className="text-left text-xs text-[var(--muted)]">
            <tr>
              <th className="py-1 pr-2 font-medium">Channel</th>
              <th className="pr-2 font-medium">Full scale (V)</th>
              <th className="pr-2 font-medium">Low cut-off (Hz)</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {sorted.map((c) => (
              <ScalingRow key={`${c.id}:${scaling.data.scaling.find((x) => x.channelId === c.id)?.version ?? 0}`} campaignId={campaignId} channel={c} current={scaling.data.scaling.find((x) => x.channelId === c.id)} canLead={canLead} />
            ))}
          </tbody>
        </table>
      )}
      {checks.data && checks.data.checks.length > 0 && (
        <div className="mt-3">
          <h3 className="text-xs font-semibold">Calibrator checks</h3>
          <ul className="num mt-1 space-y-0.5 text-xs" data-testid="sensitivity-checks">
            {checks.data.checks.slice(0, 6).map((k) => (
              <li key={k.id}>
                ch {k.channelNumber}: {k.measuredSensitivity.toFixed(3)} against {k.kitSensitivity.toFixed(3)} mV/(m/s²), {k.deviationPercent >= 0 ? '+' : ''}
                {k.deviationPercent.toFixed(2)} % ({k.deviationDb >= 0 ? '+' : ''}
                {k.deviationDb.toFixed(2)} dB) at {k.referenceMs2Rms} m/s² RMS, {k.referenceHz} Hz — {k.checkedByName ?? 'someone'}, {new Date(k.checkedAt).toLocaleString()}
              </li>
            ))}
          </ul>
        </div>
      )}
    </Panel>
  );
}

function ScalingRow({ campaignId, channel, current, canLead }: { campaignId: string; channel: Channel; current: Scaling | undefined; canLead: boolean }) {
  const [fullScale, setFullScale] = useState(current ? String(current.fullScaleVolts) : '');
  const [lowCut, setLowCut] = useState(current?.acLowCutHz != null ? String(current.acLowCutHz) : '');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();

  async function save() {
    const parsed = inputScalingSchema.safeParse({ fullScaleVolts: fullScale.trim() === '' ? undefined : Number(fullScale), acLowCutHz: lowCut.trim() === '' ? null : Number(lowCut), ...(current ? { version: current.version } : {}) });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      await api(`/campaigns/${campaignId}/channels/${channel.id}/input-scaling`, { method: 'PUT', body: parsed.data });
      await client.invalidateQueries({ queryKey: inputScalingKey(campaignId) });
      toast('ok', `Channel ${channel.channel}: ${parsed.data.fullScaleVolts} V at full scale.`);
    } catch (err) {
      fail(err, [inputScalingKey(campaignId)]);
    } finally {
      setBusy(false);
    }
  }

  if (!canLead) {
    return (
      <tr className="border-t border-[var(--line)]">
        <td className="num py-1">{channel.channel} · {channel.kind === 'hammer' ? 'hammer' : `${channel.model} ${channel.axis ?? ''}`}</td>
        <td className="num">{current ? `${current.fullScaleVolts} V` : 'not set'}</td>
        <td className="num">{current?.acLowCutHz != null ? `${current.acLowCutHz} Hz` : '—'}</td>
        <td />
      </tr>
    );
  }
  return (
    <tr className="border-t border-[var(--line)]" data-channel={channel.channel}>
      <td className="num py-1 pr-2">{channel.channel} · {channel.kind === 'hammer' ? 'hammer' : `${channel.model} ${channel.axis ?? ''}`}</td>
      <td className="pr-2">
        <input aria-label={`Full scale of channel ${channel.channel} (V)`} value={fullScale} onChange={(e) => setFullScale(e.target.value)} inputMode="decimal" className={cell} aria-invalid={!!errors.fullScaleVolts} title={errors.fullScaleVolts} />
        {errors.fullScaleVolts && <p className="text-xs text-bad">{errors.fullScaleVolts}</p>}
      </td>
      <td className="pr-2">
        <input aria-label={`Low cut-off of channel ${channel.channel} (Hz)`} value={lowCut} onChange={(e) => setLowCut(e.target.value)} inputMode="decimal" placeholder="—" className={cell} aria-invalid={!!errors.acLowCutHz} title={errors.acLowCutHz} />
        {errors.acLowCutHz && <p className="text-xs text-bad">{errors.acLowCutHz}</p>}
      </td>
      <td>
        <Button variant="secondary" disabled={busy} onClick={() => void save()} data-testid={`save-scaling-${channel.channel}`}>
          Save
        </Button>
      </td>
    </tr>
  );
}
