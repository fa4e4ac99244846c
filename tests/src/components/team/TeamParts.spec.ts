import { flushPromises } from '@vue/test-utils';
import { afterEach, describe, expect, it } from 'vitest';
import TeamInvitationList from '@/components/team/TeamInvitationList.vue';
import TeamInviteForm from '@/components/team/TeamInviteForm.vue';
import TeamMemberTable from '@/components/team/TeamMemberTable.vue';
import { buttonNamed, choose, click, confirmButton, member, mountTeam, pending } from './support';

// Each part of the team page on its own: what it shows for its props and what it asks its
// parent to do (the page's own tests cover the requests and toasts).

afterEach(() => {
  document.body.innerHTML = '';
});

async function typeEmail(value: string): Promise<void> {
  const input = document.getElementById('team-invite-email') as HTMLInputElement;
  input.value = value;
  input.dispatchEvent(new Event('input', { bubbles: true }));
  await flushPromises();
}

describe('TeamInviteForm', () => {
  it('asks for an analyst by default, and the button waits for an address', async () => {
    const { wrapper } = await mountTeam(TeamInviteForm, { props: { busy: false, error: null } });
    const form = wrapper.findComponent(TeamInviteForm);
    expect(document.querySelector('label[for="team-invite-email"]')?.textContent).toBe('E-mail');
    expect(document.querySelector('label[for="team-invite-role"]')?.textContent).toBe('Role');
    expect(document.querySelector('#team-invite-role')?.closest('.ant-select')?.querySelector('.ant-select-selection-item')?.textContent).toBe('Analyst');
    expect(buttonNamed('Send invitation').disabled).toBe(true);

    await typeEmail('kit@hill.test');
    await choose('team-invite-role', 'Admin');
    await click(buttonNamed('Send invitation'));
    expect(form.emitted('invite')).toEqual([[{ email: 'kit@hill.test', role: 'admin' }]]);
  });

  it('sends nothing while a sending is under way, and shows the error it is given', async () => {
    const { wrapper } = await mountTeam(TeamInviteForm, { props: { busy: true, error: 'The mail server did not answer.' } });
    await typeEmail('kit@hill.test');
    document.querySelector('form')!.dispatchEvent(new Event('submit', { bubbles: true, cancelable: true }));
    await flushPromises();
    expect(wrapper.findComponent(TeamInviteForm).emitted('invite')).toBeUndefined();
    expect(document.querySelector('[role="alert"]')?.textContent).toContain('The mail server did not answer.');
  });

  it('reset() clears the address and keeps the role', async () => {
    const { wrapper } = await mountTeam(TeamInviteForm, { props: { busy: false, error: null } });
    await typeEmail('kit@hill.test');
    await choose('team-invite-role', 'Viewer');
    (wrapper.findComponent(TeamInviteForm).vm as unknown as { reset: () => void }).reset();
    await flushPromises();
    expect((document.getElementById('team-invite-email') as HTMLInputElement).value).toBe('');
    expect(document.querySelector('#team-invite-role')?.closest('.ant-select')?.querySelector('.ant-select-selection-item')?.textContent).toBe('Viewer');
  });
});

describe('TeamInvitationList', () => {
  it('lists address, role, inviter and end of each pending invitation, in a region named by its heading', async () => {
    await mountTeam(TeamInvitationList, { props: { loading: false, invitations: [pending('inv1', 'eve@hill.test', 'viewer'), { ...pending('inv2', 'fay@hill.test', 'admin'), invitedBy: null }] } });
    const region = document.querySelector('section[aria-labelledby="team-invitations-title"]');
    expect(document.getElementById('team-invitations-title')?.textContent).toBe('Pending invitations');
    const rows = [...region!.querySelectorAll('tbody tr.ant-table-row')].map((r) => [...r.querySelectorAll('td')].slice(0, 3).map((c) => c.textContent?.trim()));
    expect(rows).toEqual([
      ['eve@hill.test', 'Viewer', 'Ada Admin'],
      ['fay@hill.test', 'Admin', '—'],
    ]);
    expect([...region!.querySelectorAll('button[aria-label]')].map((b) => b.getAttribute('aria-label'))).toEqual([
      'Revoke the invitation to eve@hill.test',
      'Revoke the invitation to fay@hill.test',
    ]);
  });

  it('does not claim “none” while the list is loading', async () => {
    await mountTeam(TeamInvitationList, { props: { loading: true, invitations: [] } });
    expect(document.body.textContent).not.toContain('None.');
    expect(document.querySelector('.ant-spin')).not.toBeNull();
  });

  it('asks before revoking and tells the parent which one', async () => {
    const invitation = pending('inv1', 'eve@hill.test');
    const { wrapper } = await mountTeam(TeamInvitationList, { props: { loading: false, invitations: [invitation] } });
    const list = wrapper.findComponent(TeamInvitationList);
    await click(document.querySelector('button[aria-label="Revoke the invitation to eve@hill.test"]')!);
    expect(list.emitted('revoke')).toBeUndefined();
    await click(confirmButton('Revoke'));
    expect(list.emitted('revoke')).toEqual([[invitation]]);
  });
});

describe('TeamMemberTable', () => {
  const members = [member('u1', 'Ada Admin', 'admin'), member('u2', 'Ben Analyst', 'analyst')];

  it('gives every role picker a label naming the member', async () => {
    await mountTeam(TeamMemberTable, { props: { members, loading: false, selfId: 'u1' } });
    expect([...document.querySelectorAll('label.cb-visually-hidden')].map((l) => [l.getAttribute('for'), l.textContent])).toEqual([
      ['team-role-u1', 'Role of Ada Admin'],
      ['team-role-u2', 'Role of Ben Analyst'],
    ]);
    expect(document.getElementById('team-role-u2')?.tagName).toBe('INPUT');
  });

  it('tells the parent the new role, and not when the same role is picked again', async () => {
    const { wrapper } = await mountTeam(TeamMemberTable, { props: { members, loading: false, selfId: 'u1' } });
    const table = wrapper.findComponent(TeamMemberTable);
    await choose('team-role-u2', 'Analyst');
    expect(table.emitted('changeRole')).toBeUndefined();
    await choose('team-role-u2', 'Admin');
    expect(table.emitted('changeRole')).toEqual([[members[1], 'admin']]);
  });

  it('asks one’s own row “leave”, another’s “remove”, and tells the parent whom', async () => {
    const { wrapper } = await mountTeam(TeamMemberTable, { props: { members, loading: false, selfId: 'u1' } });
    const table = wrapper.findComponent(TeamMemberTable);
    await click(document.querySelector('button[aria-label="Remove Ada Admin"]')!);
    expect(document.body.textContent).toContain('Leave this workspace? You lose access to its notebooks.');
    await click(confirmButton('Keep'));
    await click(document.querySelector('button[aria-label="Remove Ben Analyst"]')!);
    expect(document.body.textContent).toContain('Remove Ben Analyst from this workspace?');
    await click(confirmButton('Remove'));
    expect(table.emitted('remove')).toEqual([[members[1]]]);
  });
});
