// API tests on the seeded demo: a fresh app and database with the demo seed, demo accounts signed
// in through the real auth endpoint, demo campaigns found by name, and the modal fit job awaited.
import { seedDemo, DEMO_PASSWORD } from '@resonote/api/seed';
import { startTestApp, type TestApp } from './app.ts';
import { API_TEMPLATE } from './global-setup-api.ts';
import { until } from './poll.ts';

type Agent = ReturnType<TestApp['agent']>;

/** A test app on a fresh database (the API template) with the demo seeded. */
export async function startSeededApp(): Promise<TestApp> {
  const app = await startTestApp(API_TEMPLATE);
  await seedDemo(app.handle, { log: () => undefined });
  return app;
}

/** An agent of `app` signed in as the demo account `email` (e.g. lead@demo.resonote.local); throws unless 200. */
export async function signInDemo(app: TestApp, email: string): Promise<Agent> {
  const agent = app.agent();
  const res = await agent.post('/api/auth/sign-in/email').send({ email, password: DEMO_PASSWORD });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

/** The id of the campaign named `name` in the agent's campaign list; throws when it has none. */
export async function campaignIdByName(agent: Agent, name: string): Promise<string> {
  const list = (await agent.get('/api/campaigns')).body.campaigns as { id: string; name: string }[] | undefined;
  const found = list?.find((c) => c.name === name);
  if (!found) throw new Error(`no campaign named ${name} in ${JSON.stringify(list?.map((c) => c.name))}`);
  return found.id;
}

/** Polls the fit until it is done or failed (at most 60 s) and returns its body's `fit`. */
export async function waitForFit(agent: Agent, campaignId: string, fitId: string) {
  return until(
    `the fit ${fitId}`,
    async () => {
      const fit = (await agent.get(`/api/campaigns/${campaignId}/modes/fits/${fitId}`)).body.fit;
      return fit && (fit.status === 'done' || fit.status === 'failed') ? fit : null;
    },
    60_000,
  );
}
