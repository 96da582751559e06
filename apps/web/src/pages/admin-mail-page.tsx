// Admin only: the mail the local SMTP fake captured (verification, password reset, invitations).
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { api } from '../lib/api.ts';
import { Notice, Panel, Spinner } from '../components/ui.tsx';
import { formatWhen } from '../lib/format-date.ts';

interface Mail {
  id: string;
  fromAddress: string;
  toAddresses: string[];
  subject: string;
  text: string;
  receivedAt: string;
}

export function AdminMailPage() {
  const mail = useQuery({ queryKey: ['admin-mail'], queryFn: () => api<{ mail: Mail[]; capturing: boolean }>('/admin/mail'), refetchInterval: 5000 });
  const [openId, setOpenId] = useState<string>();
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold">Captured mail</h1>
        <p className="text-sm text-[var(--muted)]">Messages this instance sent through its local SMTP fake, newest first. A production instance sends through a real mail server instead.</p>
      </div>
      <Panel>
        {mail.isPending && <Spinner label="Loading mail…" />}
        {mail.isError && <Notice tone="error">{mail.error.message}</Notice>}
        {mail.data && !mail.data.capturing && <Notice tone="info">This instance sends mail through a configured SMTP server; nothing is captured here.</Notice>}
        {mail.data && mail.data.capturing && mail.data.mail.length === 0 && <p className="py-8 text-center text-sm text-[var(--muted)]">No mail has been sent yet.</p>}
        {mail.data && mail.data.mail.length > 0 && (
          <ul className="divide-y divide-[var(--line)]">
            {mail.data.mail.map((m) => (
              <li key={m.id} className="py-2">
                <button className="flex w-full items-baseline gap-3 text-left" onClick={() => setOpenId(openId === m.id ? undefined : m.id)} aria-expanded={openId === m.id}>
                  <span className="num w-40 shrink-0 text-xs text-[var(--muted)]">{formatWhen(m.receivedAt)}</span>
                  <span className="w-56 shrink-0 truncate text-sm">{m.toAddresses.join(', ')}</span>
                  <span className="truncate text-sm font-medium">{m.subject}</span>
                </button>
                {openId === m.id && <pre className="mt-2 overflow-x-auto rounded-md bg-[var(--surface)] p-3 text-xs whitespace-pre-wrap">{m.text}</pre>}
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
