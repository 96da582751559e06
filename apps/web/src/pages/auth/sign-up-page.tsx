import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/api.ts';
import { meKey } from '../../lib/session.ts';
import { Button, Field, Notice } from '../../components/ui.tsx';
import { AuthLayout } from './auth-layout.tsx';

interface PublicSettings {
  minPasswordLength: number;
  requireEmailVerification: boolean;
}

export function SignUpPage() {
  const navigate = useNavigate();
  const client = useQueryClient();
  const [params] = useSearchParams();
  // Back to where the person came from (an invitation link, say), never to another site.
  const rawNext = params.get('next');
  const next = rawNext && rawNext.startsWith('/') && !rawNext.startsWith('//') ? rawNext : null;
  const settings = useQuery({ queryKey: ['public-settings'], queryFn: () => api<PublicSettings>('/public-settings') });
  const min = settings.data?.minPasswordLength ?? 10;
  const [error, setError] = useState<string>();
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  const [sent, setSent] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const name = String(form.get('name')).trim();
    const email = String(form.get('email')).trim();
    const password = String(form.get('password'));
    const errors: Record<string, string> = {};
    if (!name) errors.name = 'Enter your name as colleagues know it.';
    if (!/^[^@\s]+@[^@\s]+\.[^@\s]+$/.test(email)) errors.email = 'Enter an e-mail address such as name@lab.example.';
    if (password.length < min) errors.password = `Use at least ${min} characters.`;
    setFieldErrors(errors);
    if (Object.keys(errors).length) return;
    setBusy(true);
    setError(undefined);
    try {
      await api('/auth/sign-up/email', { body: { name, email, password } });
      if (settings.data?.requireEmailVerification) {
        setSent(true);
        return;
      }
      client.removeQueries({ queryKey: meKey });
      navigate(next ?? '/campaigns', { replace: true });
    } catch (err) {
      setError(err instanceof ApiError ? err.message : 'Sign-up failed.');
    } finally {
      setBusy(false);
    }
  }

  if (sent) {
    return (
      <AuthLayout title="Check your mail">
        <Notice tone="ok">We sent a confirmation link to your e-mail address. Open it to finish signing up.</Notice>
      </AuthLayout>
    );
  }

  return (
    <AuthLayout title="Create an account" subtitle="A lead adds you to campaigns after you sign up. The first account on a new instance becomes its admin.">
      <form onSubmit={submit} className="flex flex-col gap-4" noValidate>
        {error && <Notice tone="error">{error}</Notice>}
        <Field id="name" name="name" label="Name" autoComplete="name" required error={fieldErrors.name} autoFocus />
        <Field id="email" name="email" type="email" label="E-mail" autoComplete="email" required error={fieldErrors.email} defaultValue={params.get('email') ?? undefined} />
        <Field id="password" name="password" type="password" label="Password" autoComplete="new-password" required hint={`At least ${min} characters.`} error={fieldErrors.password} />
        <Button type="submit" disabled={busy}>
          {busy ? 'Creating the account…' : 'Create account'}
        </Button>
        <p className="text-sm">
          Already registered?{' '}
          <Link className="text-accent hover:underline" to={next ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in'}>
            Sign in
          </Link>
        </p>
      </form>
    </AuthLayout>
  );
}
