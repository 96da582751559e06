import { useState, type FormEvent } from 'react';
import { Link } from 'react-router';
import { api, ApiError } from '../../lib/api.ts';
import { Button, Field, Notice } from '../../components/ui.tsx';
import { AuthLayout } from './auth-layout.tsx';

export function ForgotPasswordPage() {
  const [state, setState] = useState<'idle' | 'busy' | 'sent'>('idle');
  const [error, setError] = useState<string>();

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const email = String(new FormData(event.currentTarget).get('email')).trim();
    if (!email) return setError('Enter the e-mail address of your account.');
    setState('busy');
    setError(undefined);
    try {
      await api('/auth/request-password-reset', { body: { email, redirectTo: `${window.location.origin}/reset-password` } });
      setState('sent');
    } catch (err) {
      setError(err instanceof ApiError ? err.message : 'The request failed.');
      setState('idle');
    }
  }

  return (
    <AuthLayout title="Reset the password" subtitle="We mail you a link that is valid for one hour.">
      {state === 'sent' ? (
        <Notice tone="ok">If an account uses that address, a reset link is on its way. Check your mail.</Notice>
      ) : (
        <form onSubmit={submit} className="flex flex-col gap-4" noValidate>
          {error && <Notice tone="error">{error}</Notice>}
          <Field id="email" name="email" type="email" label="E-mail" autoComplete="email" required autoFocus />
          <Button type="submit" disabled={state === 'busy'}>
            {state === 'busy' ? 'Sending…' : 'Send the reset link'}
          </Button>
        </form>
      )}
      <p className="mt-4 text-sm">
        <Link className="text-accent hover:underline" to="/sign-in">
          Back to sign-in
        </Link>
      </p>
    </AuthLayout>
  );
}
