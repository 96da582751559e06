// The demo seed: role-named accounts (design.md, "Demo scenario"). Idempotent: an account that
// exists is left as it is. Campaign data joins it with the plan and hits work.
import { eq } from 'drizzle-orm';
import { user } from '@resonote/db/schema';
import type { AppHandle } from './app.ts';

export const DEMO_PASSWORD = 'resonote-demo-2026';

export const demoAccounts = [
  { role: 'admin', name: 'Ada Admin', email: 'admin@demo.resonote.local' },
  { role: 'lead', name: 'Lena Lead', email: 'lead@demo.resonote.local' },
  { role: 'engineer', name: 'Emil Engineer', email: 'engineer@demo.resonote.local' },
  { role: 'viewer', name: 'Vera Viewer', email: 'viewer@demo.resonote.local' },
] as const;

export async function ensureAccount(handle: AppHandle, account: { name: string; email: string }, password: string): Promise<string> {
  const db = handle.database.db;
  const [existing] = await db.select({ id: user.id }).from(user).where(eq(user.email, account.email));
  if (existing) return existing.id;
  const created = await handle.auth.api.signUpEmail({ body: { name: account.name, email: account.email, password } });
  await db.update(user).set({ emailVerified: true }).where(eq(user.id, created.user.id));
  return created.user.id;
}

export async function seedDemo(handle: AppHandle) {
  const db = handle.database.db;
  const ids: Record<string, string> = {};
  for (const account of demoAccounts) {
    ids[account.role] = await ensureAccount(handle, account, DEMO_PASSWORD);
  }
  // The demo admin is admin whatever the order of creation; the others are members.
  await db.update(user).set({ role: 'admin' }).where(eq(user.id, ids.admin));
  return { password: DEMO_PASSWORD, accounts: demoAccounts.map((a) => ({ ...a, id: ids[a.role] })) };
}
