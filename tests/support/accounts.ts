// Signs people up through the real auth endpoints.
import type { TestApp } from './app.ts';

export const PASSWORD = 'correct-horse-battery';

export async function signUp(app: TestApp, name: string, email: string, password = PASSWORD) {
  const agent = app.agent();
  const res = await agent.post('/api/auth/sign-up/email').send({ name, email, password });
  if (res.status !== 200) throw new Error(`sign-up of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, id: res.body.user.id as string, email };
}
