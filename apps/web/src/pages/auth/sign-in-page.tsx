import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/api.ts';
import { meKey } from '../../lib/session.ts';
import { Button, Field, Notice } from '../../components/ui.tsx';
import { AuthLayout } from './auth-layout.tsx';

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const client = useQueryClient();
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setError(undefined);
    try {
      await api('/auth/sign-in/email', { body: { email: String(form.get('email')).trim(), password: String(form.get('password')) } });
      client.removeQueries({ queryKey: meKey });
      const next = params.get('next');
      navigate(next && next.startsWith('/') && !next.startsWith('//') ? next : '/campaigns', { replace: true });
    } catch (err) {
      setError(err instanceof ApiError ? err.message : 'Sign-in failed.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <AuthLayout title="Sign in" subtitle="Use the account your test lead or admin set up for you.">
      <form onSubmit={submit} className="flex flex-col gap-4" noValidate>
        {params.get('reset') === 'done' && <Notice tone="ok">Your password was changed. Sign in with the new one.</Notice>}
        {error && <Notice tone="error">{error}</Notice>}
        <Field id="email" name="email" type="email" label="E-mail" autoComplete="email" required autoFocus />
        <Field id="password" name="password" type="password" label="Password" autoComplete="current-password" required />
        <Button type="submit" disabled={busy}>
          {busy ? 'Signing in…' : 'Sign in'}
        </Button>
        <div className="flex justify-between text-sm">
          <Link className="text-accent hover:underline" to="/forgot-password">
            Forgot the password?
          </Link>
          <Link className="text-accent hover:underline" to={params.get('next') ? `/sign-up?next=${encodeURIComponent(params.get('next')!)}` : '/sign-up'}>
            Create an account
          </Link>
        </div>
      </form>
    </AuthLayout>
  );
}
