// The campaign list's empty state names the next step that fits the caller: an invitation shown
// above the list is pointed to, never "ask a lead" beside it.
import { describe, expect, it } from 'vitest';
import { emptyListNextStep } from './campaigns-empty.ts';

const base = { isAdmin: false, canCreate: false, email: 'ivo@lab.test', invitations: [] };

describe('the empty campaign list', () => {
  it('tells someone without an invitation to ask a lead to add their address', () => {
    const step = emptyListNextStep(base);
    expect(step.title).toBe('No campaigns yet');
    expect(step.text).toMatch(/^A test lead adds you .* Ask your lead to add ivo@lab\.test/);
  });

  it('points to the one invitation above instead, with its campaign and role', () => {
    const step = emptyListNextStep({ ...base, invitations: [{ campaignName: 'Bracket B-2', role: 'viewer' }] });
    expect(step).toEqual({ title: 'No campaigns yet — one invitation waits for you', text: 'Accept the invitation to “Bracket B-2” above to join it as viewer; it then shows in this list.' });
    expect(step.text).not.toMatch(/ask/i);
  });

  it('counts several invitations, and still offers a new campaign to someone who may start one', () => {
    const step = emptyListNextStep({ ...base, canCreate: true, invitations: [{ campaignName: 'A', role: 'engineer' }, { campaignName: 'B', role: 'lead' }] });
    expect(step.title).toBe('No campaigns yet — 2 invitations wait for you');
    expect(step.text).toBe('Accept an invitation above to join that campaign with the role it names; each one you accept shows in this list. You can also start a campaign of your own with “New campaign”.');
  });

  it('tells an admin that every campaign of the instance shows here', () => {
    expect(emptyListNextStep({ ...base, isAdmin: true }).text).toMatch(/^As admin you see every campaign/);
  });
});
