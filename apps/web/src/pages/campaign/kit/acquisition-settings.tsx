// Acquisition settings (versioned): the form every lead sees with the unit beside each value,
// validated by the shared schema, saved with the version it was based on and a reason; the
// history lists what each version changed. Others see the values only.
import { useMemo, useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { acquisitionSettingsSchema, settingsChangeInWords, type AcquisitionSettings } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import { keys, type SettingsAnswer } from '../../../lib/campaign-data.ts';
import { issuesToErrors, numberOrUndefined, type FieldErrors } from '../../../lib/forms.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Field, Panel } from '../../../components/ui.tsx';
import { NumberField, Select } from '../../../components/form-controls.tsx';
import { formatWhen } from '../../../lib/format-date.ts';

interface Spec {
  path: string;
  label: string;
  unit: string;
  hint?: string;
}
const groups: { title: string; fields: Spec[] }[] = [
  {
    title: 'Record',
    fields: [
      { path: 'sampleRateHz', label: 'Sample rate', unit: 'Hz' },
      { path: 'recordLengthS', label: 'Record length', unit: 's' },
      { path: 'preTriggerS', label: 'Pre-trigger', unit: 's' },
      { path: 'triggerLevelN', label: 'Trigger level', unit: 'N' },
      { path: 'bandHz.low', label: 'Band from', unit: 'Hz' },
      { path: 'bandHz.high', label: 'Band to', unit: 'Hz' },
    ],
  },
  {
    title: 'Windows and averaging',
    fields: [
      { path: 'forceWindow.lengthS', label: 'Force window length', unit: 's', hint: 'Unity part from the record start, pre-trigger included.' },
      { path: 'forceWindow.taperS', label: 'Force window taper', unit: 's', hint: 'Half-cosine taper after the unity part.' },
      { path: 'hitsToAverage', label: 'Hits to average', unit: 'hits' },
    ],
  },
  {
    title: 'Hit checks and ranges',
    fields: [
      { path: 'doubleHitRatio', label: 'Double-hit ratio', unit: '× 1st peak', hint: 'A second pulse above this fraction of the first is a double hit.' },
      { path: 'overloadPercent', label: 'Overload at', unit: '% range' },
      { path: 'rollOffDb', label: 'Largest force roll-off', unit: 'dB', hint: 'Across the band.' },
      { path: 'coherenceThreshold', label: 'Coherence to finish a DOF', unit: '0–1', hint: 'Mean over the band.' },
      { path: 'minPeakN', label: 'Weakest peak force', unit: 'N' },
      { path: 'forceRangeN', label: 'Force input range', unit: 'N' },
      { path: 'responseRangeMs2', label: 'Response input range', unit: 'm/s²' },
    ],
  },
];

const get = (o: unknown, path: string) => path.split('.').reduce<unknown>((v, k) => (v as Record<string, unknown> | undefined)?.[k], o);
function set(o: Record<string, unknown>, path: string, value: unknown) {
  const parts = path.split('.');
  let cur = o;
  for (const p of parts.slice(0, -1)) cur = (cur[p] ??= {}) as Record<string, unknown>;
  cur[parts.at(-1)!] = value;
}
const fmtValue = (v: unknown) => (v === null || v === undefined ? '—' : typeof v === 'object' ? JSON.stringify(v) : String(v));

export function AcquisitionSettingsCard({ campaignId, data, canLead }: { campaignId: string; data: SettingsAnswer; canLead: boolean }) {
  const cur = data.current;
  return (
    <Panel
      title={
        <>
          Acquisition settings{' '}
          <span className="num font-normal text-[var(--muted)]">
            {cur.version === 0 ? '(defaults, not saved yet)' : `(version ${cur.version}${cur.createdBy ? `, by ${cur.createdBy}` : ''})`}
          </span>
        </>
      }
    >
      {canLead ? <SettingsForm key={cur.version} campaignId={campaignId} data={data} /> : <SettingsSummary settings={cur.settings} />}
      <History history={data.history} />
    </Panel>
  );
}

function Derived({ s }: { s: Partial<AcquisitionSettings> }) {
  const fs = Number(s.sampleRateHz);
  const T = Number(s.recordLengthS);
  if (!(fs > 0 && T > 0)) return null;
  return (
    <p className="num text-xs text-[var(--muted)]">
      {Math.round(fs * T).toLocaleString('en-US')} samples per channel · Δf = {(1 / T).toPrecision(3)} Hz · Nyquist {fs / 2} Hz
    </p>
  );
}

function SettingsSummary({ settings }: { settings: AcquisitionSettings }) {
  const ew = settings.exponentialWindow;
  return (
    <div className="space-y-3">
      {groups.map((g) => (
        <div key={g.title}>
          <h3 className="mb-1 text-xs font-semibold text-[var(--muted)] uppercase">{g.title}</h3>
          <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
            {g.fields.map((f) => (
              <div key={f.path} className="flex justify-between gap-2 border-b border-dashed border-[var(--line)] py-0.5">
                <dt>{f.label}</dt>
                <dd className="num">
                  {fmtValue(get(settings, f.path))} <span className="text-[var(--muted)]">{f.unit}</span>
                </dd>
              </div>
            ))}
          </dl>
        </div>
      ))}
      <p className="text-sm">
        Exponential window: <span className="num">{ew.mode === 'none' ? 'none' : ew.mode === 'tau' ? `τ = ${ew.tauS} s` : `${ew.endLevelPercent} % at the record end`}</span> · Estimator: <span className="num">{settings.estimator}</span>
      </p>
      <p className="text-sm">
        Files at another sample rate: {settings.resampleUploads ? 'resampled' : 'refused'} · Bridge file names: <span className="num">{settings.bridgeFilePattern || 'armed DOF (no pattern)'}</span>
      </p>
      <Derived s={settings} />
    </div>
  );
}

function SettingsForm({ campaignId, data }: { campaignId: string; data: SettingsAnswer }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const initial = useMemo(() => {
    const out: Record<string, string> = {};
    for (const g of groups) for (const f of g.fields) out[f.path] = String(get(data.current.settings, f.path) ?? '');
    const ew = data.current.settings.exponentialWindow;
    out.ewMode = ew.mode;
    out.tauS = ew.mode === 'tau' ? String(ew.tauS) : '0.3';
    out.endLevelPercent = ew.mode === 'end-level' ? String(ew.endLevelPercent) : '1';
    out.estimator = data.current.settings.estimator;
    out.resampleUploads = String(data.current.settings.resampleUploads ?? false);
    out.bridgeFilePattern = data.current.settings.bridgeFilePattern ?? '';
    return out;
  }, [data]);
  const [values, setValues] = useState(initial);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);

  const build = () => {
    const s: Record<string, unknown> = {};
    for (const g of groups) for (const f of g.fields) set(s, f.path, numberOrUndefined(values[f.path] ?? ''));
    s.estimator = values.estimator;
    s.resampleUploads = values.resampleUploads === 'true';
    s.bridgeFilePattern = values.bridgeFilePattern ?? '';
    s.exponentialWindow =
      values.ewMode === 'none' ? { mode: 'none' } : values.ewMode === 'tau' ? { mode: 'tau', tauS: numberOrUndefined(values.tauS ?? '') } : { mode: 'end-level', endLevelPercent: numberOrUndefined(values.endLevelPercent ?? '') };
    return s;
  };

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = acquisitionSettingsSchema.safeParse(build());
    if (!parsed.success) {
      const errs = issuesToErrors(parsed.error);
      if (errs.forceWindow) errs['forceWindow.lengthS'] ??= errs.forceWindow;
      setErrors(errs);
      toast('error', 'Some settings need fixing; see the messages beside the fields.');
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const r = await api<{ current: SettingsAnswer['current']; unchanged: boolean }>(`/campaigns/${campaignId}/settings`, { method: 'PUT', body: { baseVersion: data.current.version, settings: parsed.data, reason } });
      if (r.unchanged) toast('info', 'The settings equal the current version; nothing was saved.');
      else toast('ok', `Acquisition settings saved as version ${r.current.version}.`);
      await client.invalidateQueries({ queryKey: keys.settings(campaignId) });
    } catch (err) {
      fail(err, [keys.settings(campaignId)]);
    } finally {
      setBusy(false);
    }
  }
  const bind = (path: string) => ({
    value: values[path] ?? '',
    onChange: (e: { target: { value: string } }) => setValues((v) => ({ ...v, [path]: e.target.value })),
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label="Acquisition settings">
      {groups.map((g) => (
        <fieldset key={g.title}>
          <legend className="mb-2 text-xs font-semibold text-[var(--muted)] uppercase">{g.title}</legend>
          <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
            {g.fields.map((f) => (
              <NumberField key={f.path} id={`set-${f.path}`} label={f.label} unit={f.unit} hint={f.hint} error={errors[f.path]} {...bind(f.path)} />
            ))}
            {g.title === 'Windows and averaging' && (
              <>
                <Select
                  id="set-ew-mode"
                  label="Exponential window"
                  options={[
                    ['none', 'None'],
                    ['tau', 'Time constant τ'],
                    ['end-level', 'End level'],
                  ]}
                  {...bind('ewMode')}
                />
                {values.ewMode === 'tau' && <NumberField id="set-ew-tau" label="Time constant τ" unit="s" error={errors['exponentialWindow.tauS']} {...bind('tauS')} />}
                {values.ewMode === 'end-level' && <NumberField id="set-ew-end" label="Level at the record end" unit="%" error={errors['exponentialWindow.endLevelPercent']} {...bind('endLevelPercent')} />}
                <Select
                  id="set-estimator"
                  label="Estimator"
                  options={[
                    ['H1', 'H1 (noise on the response)'],
                    ['H2', 'H2 (noise on the force)'],
                  ]}
                  {...bind('estimator')}
                />
              </>
            )}
          </div>
        </fieldset>
      ))}
      <fieldset>
        <legend className="mb-2 text-xs font-semibold text-[var(--muted)] uppercase">Files from other acquisition programs</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          <Select
            id="set-resample"
            label="A file at another sample rate"
            options={[
              ['false', 'is refused'],
              ['true', 'is resampled to the rate above (polyphase, anti-aliased)'],
            ]}
            hint="Resampled uploads keep the file as made beside the hits, and their FRF says it was resampled."
            {...bind('resampleUploads')}
          />
          <Field id="set-pattern" label="File name pattern for the bridge" placeholder="{response}_{excitation}_*.wav" hint="Names the DOF in each file, e.g. P07+Z_P01+Z_003.wav. Empty: files go to the DOF the engineer has armed on Tap." error={errors.bridgeFilePattern} {...bind('bridgeFilePattern')} />
        </div>
      </fieldset>
      <Derived s={{ sampleRateHz: Number(values.sampleRateHz), recordLengthS: Number(values.recordLengthS) }} />
      <div className="grid items-end gap-3 sm:grid-cols-[1fr_auto]">
        <Field id="set-reason" label="Reason for the change" placeholder="e.g. band raised to 3 kHz for the second bending mode" value={reason} onChange={(e) => setReason(e.target.value)} hint="Kept in the history with the version." />
        <div className="flex gap-2 sm:mb-5">
          <Button type="submit" disabled={busy}>
            {busy ? 'Saving…' : 'Save settings'}
          </Button>
          <Button type="button" variant="ghost" onClick={() => setValues({ ...initial, ...Object.fromEntries(Object.entries(flatDefaults(data.defaults))) })}>
            Fill in the defaults
          </Button>
        </div>
      </div>
    </form>
  );
}

function flatDefaults(d: AcquisitionSettings): Record<string, string> {
  const out: Record<string, string> = {};
  for (const g of groups) for (const f of g.fields) out[f.path] = String(get(d, f.path) ?? '');
  out.ewMode = d.exponentialWindow.mode;
  if (d.exponentialWindow.mode === 'end-level') out.endLevelPercent = String(d.exponentialWindow.endLevelPercent);
  if (d.exponentialWindow.mode === 'tau') out.tauS = String(d.exponentialWindow.tauS);
  out.estimator = d.estimator;
  out.resampleUploads = String(d.resampleUploads);
  out.bridgeFilePattern = d.bridgeFilePattern;
  return out;
}

function History({ history }: { history: SettingsAnswer['history'] }) {
  return (
    <div className="mt-5 border-t border-[var(--line)] pt-3">
      <h3 className="mb-2 text-sm font-semibold">History</h3>
      {history.length === 0 && <p className="text-sm text-[var(--muted)]">No version saved yet; hits will use the defaults shown until a lead saves the settings.</p>}
      <ol className="space-y-2 text-sm" data-testid="settings-history">
        {history.map((h) => (
          <li key={h.version} className="rounded-md border border-[var(--line)] px-3 py-2">
            <div className="flex flex-wrap gap-x-3 text-xs text-[var(--muted)]">
              <span className="num font-semibold text-[var(--ink)]">Version {h.version}</span>
              <span className="num">{formatWhen(h.createdAt)}</span>
              <span>{h.createdBy ?? 'unknown'}</span>
            </div>
            <p className="mt-0.5">{h.reason || <span className="text-[var(--muted)]">No reason given.</span>}</p>
            {h.changes.length > 0 && (
              <ul className="num mt-1 space-y-0.5 text-xs">
                {h.changes.map((c) => (
                  <li key={c.field}>{settingsChangeInWords(c)}</li>
                ))}
              </ul>
            )}
          </li>
        ))}
      </ol>
    </div>
  );
}
