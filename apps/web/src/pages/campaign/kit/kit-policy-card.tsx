// The lead's calibration policy for this campaign: warn or block on an overdue or missing
// calibration, and the tolerance beyond which a new sensitivity has to be confirmed.
import { useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { kitPolicyPutSchema } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import { issuesToErrors, numberOrUndefined, type FieldErrors } from '../../../lib/forms.ts';
import { labKeys, useKitPolicy } from '../../../lib/lab-data.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Notice, Panel, Spinner } from '../../../components/ui.tsx';
import { NumberField, Select } from '../../../components/form-controls.tsx';

export function KitPolicyCard({ campaignId, canLead }: { campaignId: string; canLead: boolean }) {
  const policy = useKitPolicy(campaignId);
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const p = policy.data?.policy;

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (!p) return;
    const f = new FormData(e.currentTarget);
    const parsed = kitPolicyPutSchema.safeParse({ baseVersion: p.version, calibration: String(f.get('calibration')), changeTolerancePct: numberOrUndefined(f.get('changeTolerancePct')) });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    try {
      await api(`/campaigns/${campaignId}/kit-policy`, { method: 'PUT', body: parsed.data });
      await Promise.all([client.invalidateQueries({ queryKey: labKeys.policy(campaignId) }), client.invalidateQueries({ queryKey: labKeys.readiness(campaignId) })]);
      toast('ok', parsed.data.calibration === 'block' ? 'Hits with an overdue or missing calibration are now refused.' : 'Overdue or missing calibrations now warn on Tap; hits are taken.');
    } catch (err) {
      fail(err, [labKeys.policy(campaignId)]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <Panel title="Calibration policy">
      {policy.isPending && <Spinner label="Loading the policy…" />}
      {policy.isError && <Notice tone="error">The policy could not be loaded: {policy.error.message}</Notice>}
      {p && !canLead && (
        // Read-only for everyone but the lead: the policy in words, no form controls.
        <dl className="grid gap-1 text-sm sm:grid-cols-[auto_minmax(0,1fr)] sm:gap-x-4" data-testid="kit-policy">
          <dt className="text-[var(--muted)]">An overdue or missing calibration on Tap</dt>
          <dd>{p.calibration === 'block' ? 'Blocks hits until it is recorded' : 'Warns; hits are taken'}</dd>
          <dt className="text-[var(--muted)]">Confirm a sensitivity change beyond</dt>
          <dd className="num">{p.changeTolerancePct} % (5 % is common practice)</dd>
        </dl>
      )}
      {p && canLead && (
        <form key={p.version} onSubmit={submit} className="grid items-end gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,12rem)_auto]" aria-label="Calibration policy" data-testid="kit-policy">
          <Select
            id="policy-calibration"
            name="calibration"
            label="An overdue or missing calibration on Tap"
            defaultValue={p.calibration}
            disabled={!canLead}
            options={[
              ['warn', 'Warns; hits are taken'],
              ['block', 'Blocks hits until it is recorded'],
            ]}
            error={errors.calibration}
          />
          <NumberField id="policy-tolerance" name="changeTolerancePct" label="Confirm a sensitivity change beyond" unit="%" defaultValue={p.changeTolerancePct} disabled={!canLead} step="any" hint="5 % is common practice." error={errors.changeTolerancePct} />
          {canLead && (
            <Button type="submit" variant="secondary" disabled={busy}>
              Save policy
            </Button>
          )}
        </form>
      )}
    </Panel>
  );
}
