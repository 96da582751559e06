// Campaign settings: name, structure, client, purpose, status, test type, reference DOFs and the
// simulated rig model. Leads edit (PATCH with the version read); others read.
import { useState, type FormEvent, type ReactNode } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { campaignPatchSchema, campaignStatuses, statusLabels } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import { keys, purposeLabel, simulatorLabel, testTypeLabel, type Campaign } from '../../../lib/campaign-data.ts';
import { issuesToErrors, splitList, type FieldErrors } from '../../../lib/forms.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Field, Panel } from '../../../components/ui.tsx';
import { Select } from '../../../components/form-controls.tsx';
import { CampaignStatusBadge } from '../../../components/status.tsx';

export function CampaignSettingsCard({ campaign, canLead }: { campaign: Campaign; canLead: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);

  if (!canLead) {
    return (
      <Panel title="Campaign settings">
        <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2">
          <Item term="Structure">{campaign.structure || '—'}</Item>
          <Item term="Client">{campaign.client || '—'}</Item>
          <Item term="Purpose">{purposeLabel[campaign.purpose]}</Item>
          <Item term="Status">
            <CampaignStatusBadge status={campaign.status} />
          </Item>
          <Item term="Test type">{testTypeLabel[campaign.testType]}</Item>
          <Item term="Reference DOFs">{campaign.referenceDofs.length ? <span className="num">{campaign.referenceDofs.join(', ')}</span> : 'Not set'}</Item>
          <Item term="Simulated rig model">{simulatorLabel[campaign.simulator]}</Item>
        </dl>
      </Panel>
    );
  }

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const wanted = {
      name: String(f.get('name') ?? ''),
      structure: String(f.get('structure') ?? ''),
      client: String(f.get('client') ?? ''),
      purpose: String(f.get('purpose')),
      status: String(f.get('status')),
      testType: String(f.get('testType')),
      referenceDofs: splitList(String(f.get('referenceDofs') ?? '')),
      simulator: String(f.get('simulator')),
    };
    const changes: Record<string, unknown> = { version: campaign.version };
    for (const [k, v] of Object.entries(wanted)) {
      const before = campaign[k as keyof Campaign];
      if (JSON.stringify(before) !== JSON.stringify(v)) changes[k] = v;
    }
    const parsed = campaignPatchSchema.safeParse(changes);
    if (!parsed.success) {
      const errs = issuesToErrors(parsed.error);
      for (const k of Object.keys(errs)) if (k.startsWith('referenceDofs.')) errs.referenceDofs ??= errs[k]!;
      return setErrors(errs);
    }
    setErrors({});
    if (Object.keys(changes).length === 1) return toast('info', 'Nothing changed.');
    setBusy(true);
    try {
      const res = await api<{ campaign: Campaign }>(`/campaigns/${campaign.id}`, { method: 'PATCH', body: parsed.data });
      client.setQueryData(keys.campaign(campaign.id), (old: { myRole: string } | undefined) => ({ ...old, campaign: res.campaign }));
      void client.invalidateQueries({ queryKey: ['campaigns'] });
      toast('ok', 'Campaign settings saved.');
    } catch (err) {
      fail(err, [keys.campaign(campaign.id)]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <Panel title="Campaign settings">
      <form key={campaign.version} onSubmit={submit} noValidate className="grid gap-4 sm:grid-cols-2 xl:grid-cols-4">
        <Field id="c-name" name="name" label="Name" defaultValue={campaign.name} error={errors.name} />
        <Field id="c-structure" name="structure" label="Structure" defaultValue={campaign.structure} error={errors.structure} />
        <Field id="c-client" name="client" label="Client" defaultValue={campaign.client} error={errors.client} />
        <Select id="c-status" name="status" label="Status" defaultValue={campaign.status} options={campaignStatuses.map((s) => [s, statusLabels[s]])} />
        <Select id="c-purpose" name="purpose" label="Purpose" defaultValue={campaign.purpose} options={Object.entries(purposeLabel)} />
        <Select
          id="c-test-type"
          name="testType"
          label="Test type"
          defaultValue={campaign.testType}
          options={Object.entries(testTypeLabel)}
          hint="Roving hammer: accelerometers stay at the reference DOFs. Roving response: the hammer stays."
        />
        <Field
          id="c-reference"
          name="referenceDofs"
          label="Reference DOFs"
          defaultValue={campaign.referenceDofs.join(', ')}
          placeholder="B21:+Z"
          hint="Point:±axis, e.g. B21:+Z; separate several with commas."
          error={errors.referenceDofs}
        />
        <Select id="c-simulator" name="simulator" label="Simulated rig model" defaultValue={campaign.simulator} options={Object.entries(simulatorLabel)} hint="Structure behind simulated hits." />
        <div className="sm:col-span-2 xl:col-span-4">
          <Button type="submit" disabled={busy}>
            {busy ? 'Saving…' : 'Save campaign settings'}
          </Button>
        </div>
      </form>
    </Panel>
  );
}

function Item({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-xs text-[var(--muted)]">{term}</dt>
      <dd>{children}</dd>
    </div>
  );
}
