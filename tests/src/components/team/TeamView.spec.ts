import { afterEach, describe, expect, it, vi } from 'vitest';
import type { PendingInvitation } from '../../../../shared/api/invitations.js';
import type { WorkspaceMember } from '../../../../shared/api/workspaces.js';
import TeamView from '@/views/TeamView.vue';
import { buttonNamed, choose, click, confirmButton, fakeServer, member, mountTeam, pending, toasts } from './support';

// The team page as its admin uses it, against a stand-in server: invite, see and revoke
// pending invitations, change roles and remove members.

const ADA = { id: 'u1', name: 'Ada Admin', email: 'ada@hill.test', emailVerified: true };
const MEMBERS = '/api/workspaces/ws1/members';
const INVITATIONS = '/api/workspaces/ws1/invitations';

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

/** The stand-in server's state, changed by the requests the page makes. */
function lab(initial: { members?: WorkspaceMember[]; invitations?: PendingInvitation[] } = {}) {
  const state = {
    members: initial.members ?? [member('u1', 'Ada Admin', 'admin'), member('u2', 'Ben Analyst', 'analyst'), member('u3', 'Cy Viewer', 'viewer')],
    invitations: initial.invitations ?? [],
  };
  const seen = fakeServer({
    [`GET ${MEMBERS}`]: () => ({ body: { members: state.members } }),
    [`GET ${INVITATIONS}`]: () => ({ body: { invitations: state.invitations } }),
    [`POST ${INVITATIONS}`]: (body) => {
      const { email, role } = body as { email: string; role: PendingInvitation['role'] };
      const created = pending(`inv${state.invitations.length + 1}`, email.toLowerCase(), role);
      state.invitations = [created, ...state.invitations];
      return { status: 201, body: created };
    },
    [`DELETE ${INVITATIONS}/inv1`]: () => {
      state.invitations = state.invitations.filter((i) => i.id !== 'inv1');
      return { status: 204 };
    },
    [`PATCH ${MEMBERS}/u2`]: (body) => {
      state.members = state.members.map((m) => (m.user.id === 'u2' ? { ...m, role: (body as { role: WorkspaceMember['role'] }).role } : m));
      return { body: state.members.find((m) => m.user.id === 'u2') };
    },
    [`DELETE ${MEMBERS}/u3`]: () => {
      state.members = state.members.filter((m) => m.user.id !== 'u3');
      return { status: 204 };
    },
  });
  return { state, seen };
}

const rowsOf = (selector: string) => [...document.body.querySelectorAll<HTMLTableRowElement>(`${selector} tbody tr.ant-table-row`)];
const memberRows = () => rowsOf('.cb-page > .ant-table-wrapper');
const invitationRows = () => rowsOf('.team-invitations');
const emailInput = () => document.getElementById('team-invite-email') as HTMLInputElement;

async function typeEmail(value: string): Promise<void> {
  const input = emailInput();
  input.value = value;
  input.dispatchEvent(new Event('input', { bubbles: true }));
  await new Promise((r) => setTimeout(r, 0));
}

describe('TeamView', () => {
  it('lists the members with their roles, marks the admin’s own row, and says when nothing is pending', async () => {
    lab();
    await mountTeam(TeamView, { signedInAs: ADA });

    expect(document.querySelector('h1')?.textContent).toBe('Team');
    expect(document.body.textContent).toContain('Who works in Hill Lab.');
    expect(memberRows().map((r) => [r.cells[0]!.textContent?.trim(), r.cells[1]!.textContent?.trim(), r.querySelector('.ant-select-selection-item')?.textContent])).toEqual([
      ['Ada Admin (you)', 'ada@hill.test', 'Admin'],
      ['Ben Analyst', 'ben@hill.test', 'Analyst'],
      ['Cy Viewer', 'cy@hill.test', 'Viewer'],
    ]);
    expect(document.body.textContent).toContain('None. Invitations show here until they are accepted, revoked or run out.');
    expect(invitationRows()).toHaveLength(0);
  });

  it('sends an invitation with the chosen role, clears the address, and lists it as pending', async () => {
    const { seen } = lab();
    await mountTeam(TeamView, { signedInAs: ADA });

    await typeEmail('  Dee.Rider@hill.test ');
    await choose('team-invite-role', 'Viewer');
    await click(buttonNamed('Send invitation'));

    expect(seen.filter((r) => r.method === 'POST')).toEqual([{ method: 'POST', path: INVITATIONS, body: { email: 'Dee.Rider@hill.test', role: 'viewer' } }]);
    expect(toasts()).toContain('Invitation sent to dee.rider@hill.test. They join as viewer when they open the link.');
    expect(emailInput().value).toBe('');
    expect(invitationRows().map((r) => [...r.cells].slice(0, 3).map((c) => c.textContent?.trim()))).toEqual([['dee.rider@hill.test', 'Viewer', 'Ada Admin']]);
  });

  it('sends nothing for an address without @, and keeps the address with the server’s reason when it refuses', async () => {
    const seen = fakeServer({
      [`GET ${MEMBERS}`]: { body: { members: [member('u1', 'Ada Admin', 'admin')] } },
      [`GET ${INVITATIONS}`]: { body: { invitations: [] } },
      [`POST ${INVITATIONS}`]: { status: 409, body: { error: { code: 'already_member', message: 'ben@hill.test is already a member of Hill Lab.' } } },
    });
    await mountTeam(TeamView, { signedInAs: ADA });

    await typeEmail('ben.hill.test');
    expect(buttonNamed('Send invitation').disabled).toBe(true);
    document.querySelector('form.team-invite')!.dispatchEvent(new Event('submit', { bubbles: true, cancelable: true }));
    await new Promise((r) => setTimeout(r, 0));
    expect(seen.some((r) => r.method === 'POST')).toBe(false);

    await typeEmail('ben@hill.test');
    await click(buttonNamed('Send invitation'));
    expect(seen.filter((r) => r.method === 'POST')).toHaveLength(1);
    expect(document.querySelector('.team-invite [role="alert"]')?.textContent).toContain('ben@hill.test is already a member of Hill Lab.');
    expect(emailInput().value).toBe('ben@hill.test');
  });

  it('revokes a pending invitation only after the confirmation, and the list empties', async () => {
    const { seen } = lab({ invitations: [pending('inv1', 'eve@hill.test')] });
    await mountTeam(TeamView, { signedInAs: ADA });
    expect(invitationRows().map((r) => r.cells[0]!.textContent?.trim())).toEqual(['eve@hill.test']);

    await click(document.querySelector('button[aria-label="Revoke the invitation to eve@hill.test"]')!);
    expect(document.body.textContent).toContain('Revoke the invitation to eve@hill.test? The link stops working at once.');
    await click(confirmButton('Keep'));
    expect(seen.some((r) => r.method === 'DELETE')).toBe(false);

    await click(document.querySelector('button[aria-label="Revoke the invitation to eve@hill.test"]')!);
    await click(confirmButton('Revoke'));
    expect(seen.filter((r) => r.method === 'DELETE').map((r) => r.path)).toEqual([`${INVITATIONS}/inv1`]);
    expect(toasts()).toContain('The invitation to eve@hill.test was revoked.');
    expect(invitationRows()).toHaveLength(0);
    expect(document.body.textContent).toContain('None. Invitations show here');
  });

  it('changes a member’s role from the table', async () => {
    const { seen } = lab();
    await mountTeam(TeamView, { signedInAs: ADA });

    await choose('team-role-u2', 'Viewer');

    expect(seen.filter((r) => r.method === 'PATCH')).toEqual([{ method: 'PATCH', path: `${MEMBERS}/u2`, body: { role: 'viewer' } }]);
    expect(toasts()).toContain('Ben Analyst is now a viewer.');
    expect(memberRows()[1]!.querySelector('.ant-select-selection-item')?.textContent).toBe('Viewer');
  });

  it('removes a member after the confirmation', async () => {
    const { seen } = lab();
    await mountTeam(TeamView, { signedInAs: ADA });

    await click(document.querySelector('button[aria-label="Remove Cy Viewer"]')!);
    expect(document.body.textContent).toContain('Remove Cy Viewer from this workspace?');
    await click(confirmButton('Remove'));

    expect(seen.filter((r) => r.method === 'DELETE').map((r) => r.path)).toEqual([`${MEMBERS}/u3`]);
    expect(toasts()).toContain('Cy Viewer was removed.');
    expect(memberRows().map((r) => r.cells[0]!.textContent?.trim())).toEqual(['Ada Admin (you)', 'Ben Analyst']);
  });

  it('says so when a role change is refused, and keeps the role shown', async () => {
    const seen = fakeServer({
      [`GET ${MEMBERS}`]: { body: { members: [member('u1', 'Ada Admin', 'admin'), member('u2', 'Ben Analyst', 'analyst')] } },
      [`GET ${INVITATIONS}`]: { body: { invitations: [] } },
      [`PATCH ${MEMBERS}/u1`]: { status: 409, body: { error: { code: 'last_admin', message: 'A workspace needs at least one admin.' } } },
    });
    await mountTeam(TeamView, { signedInAs: ADA });

    await choose('team-role-u1', 'Analyst');

    expect(seen.filter((r) => r.method === 'PATCH')).toHaveLength(1);
    expect(toasts()).toContain('A workspace needs at least one admin.');
    expect(memberRows()[0]!.querySelector('.ant-select-selection-item')?.textContent).toBe('Admin');
  });
});
