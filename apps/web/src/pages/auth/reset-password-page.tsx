import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { api, ApiError } from '../../lib/api.ts';
import { Button, Field, Notice } from '../../components/ui.tsx';
import { AuthLayout } from './auth-layout.tsx';

export function ResetPasswordPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const token = params.get('token');
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const password = String(form.get('password'));
    if (password !== String(form.get('confirm'))) return setError('The two passwords differ.');
    setBusy(true);
    setError(undefined);
    try {
      await api('/auth/reset-password', { body: { newPassword: password, token } });
      navigate('/sign-in?reset=done', { replace: true });
    } catch (err) {
      setError(err instanceof ApiError ? err.message : 'The reset failed.');
    } finally {
      setBusy(false);
    }
  }

  if (!token || params.get('error')) {
    return (
      <AuthLayout title="Reset the password">
        <Notice tone="error">This reset link is invalid or has expired.</Notice>
        <p className="mt-4 text-sm">
          <Link className="text-accent hover:underline" to="/forgot-password">
            Ask for a new link
          </Link>
        </p>
      </AuthLayout>
    );
  }

  return (
    <AuthLayout title="Choose a new password" subtitle="Every session of your account is signed out when you save it.">
      <form onSubmit={submit} className="flex flex-col gap-4" noValidate>
        {error && <Notice tone="error">{error}</Notice>}
        <Field id="password" name="password" type="password" label="New password" autoComplete="new-password" hint="At least 10 characters." required autoFocus />
        <Field id="confirm" name="confirm" type="password" label="New password, again" autoComplete="new-password" required />
        <Button type="submit" disabled={busy}>
          {busy ? 'Saving…' : 'Save the new password'}
        </Button>
      </form>
    </AuthLayout>
  );
}
