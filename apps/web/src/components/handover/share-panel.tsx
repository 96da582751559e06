// Share the hand-over: an expiring link to the report, or an invitation to join as a viewer,
// sent by e-mail to the recipients typed in (comma or new-line separated, each checked).
import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { api } from '../../lib/api.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { parseRecipients } from '../../lib/transfer.ts';
import { Button } from '../ui.tsx';
import { NumberField, Select, TextArea } from '../form-controls.tsx';
import { formatWhen } from '../../lib/format-date.ts';

type ShareMode = 'report-link' | 'viewer-invitation';
interface ShareAnswer {
  mode: ShareMode;
  expiresAt: string;
  sent: string[];
  skipped: { email: string; reason: string }[];
  link?: string;
}

export function SharePanel({ campaignId }: { campaignId: string }) {
  const toast = useToast();
  const fail = useFailure();
  const [recipients, setRecipients] = useState('');
  const [mode, setMode] = useState<ShareMode>('report-link');
  const [days, setDays] = useState('14');
  const [message, setMessage] = useState('');
  const [touched, setTouched] = useState(false);

  const parsed = parseRecipients(recipients);
  const daysN = Number(days);
  const recipientsError = parsed.valid.length > 20 ? 'At most 20 recipients at once.' : parsed.invalid.length ? `Not an e-mail address: ${parsed.invalid.join(', ')}` : parsed.valid.length === 0 ? 'Enter at least one e-mail address.' : undefined;
  const daysError = !Number.isInteger(daysN) || daysN < 1 || daysN > 90 ? 'Enter a whole number of days from 1 to 90.' : undefined;

  const share = useMutation({
    mutationFn: () => api<ShareAnswer>(`/campaigns/${campaignId}/share`, { body: { recipients: parsed.valid, mode, expiresInDays: daysN, ...(message.trim() ? { message: message.trim() } : {}) } }),
    onSuccess: (answer) => {
      const n = answer.sent?.length ?? 0;
      const what = answer.mode === 'viewer-invitation' ? 'Viewer invitation' : 'Report link';
      const skipped = answer.skipped?.length ? ` Not sent to ${answer.skipped.map((x) => `${x.email} (${x.reason})`).join(', ')}.` : '';
      toast(n ? 'ok' : 'info', `${what} sent to ${n} recipient${n === 1 ? '' : 's'}${answer.expiresAt ? `; it expires on ${formatWhen(answer.expiresAt, 'date')}` : ''}.${skipped}`);
      setRecipients('');
      setMessage('');
      setTouched(false);
    },
    onError: (err) => fail(err),
  });

  return (
    <form
      className="space-y-3"
      aria-label="Share the hand-over"
      onSubmit={(e) => {
        e.preventDefault();
        setTouched(true);
        if (!recipientsError && !daysError) share.mutate();
      }}
    >
      <TextArea id="share-recipients" label="Recipients" hint="E-mail addresses, separated by commas or new lines." value={recipients} onChange={(e) => setRecipients(e.target.value)} error={touched || parsed.invalid.length ? recipientsError : undefined} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Select
          id="share-mode"
          label="What they get"
          value={mode}
          onChange={(e) => setMode(e.target.value as ShareMode)}
          options={[
            ['report-link', 'Expiring link to the report'],
            ['viewer-invitation', 'Invitation to join as viewer'],
          ]}
        />
        <NumberField id="share-days" label="Expires after" unit="days" value={days} onChange={(e) => setDays(e.target.value)} error={daysError} />
      </div>
      <TextArea id="share-message" label="Message (optional)" value={message} onChange={(e) => setMessage(e.target.value)} />
      <Button type="submit" disabled={share.isPending}>
        {share.isPending ? 'Sending…' : 'Send'}
      </Button>
    </form>
  );
}
