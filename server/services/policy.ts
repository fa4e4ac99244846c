import type { NotebookRole } from '../../shared/api/notebooks.js';
import type { WorkspaceRole } from '../../shared/api/workspaces.js';
import { AppError, forbidden, notFound } from '../errors.js';

/**
 * Who may do what. Every service asks this module; no route decides access itself.
 *
 * Workspace roles (workspace_member.role):
 *
 * | Action                                   | admin | analyst | viewer | not a member |
 * |------------------------------------------|-------|---------|--------|--------------|
 * | see the workspace and its member list    | yes   | yes     | yes    | 404          |
 * | add / change / remove members            | yes   | 403     | 403    | 404          |
 * | create a notebook, upload files          | yes   | yes     | 403    | 404          |
 * | read every notebook of the workspace     | yes   | yes     | yes    | via grant    |
 * | edit (save, restore) any notebook in it  | yes   | yes     | 403    | via grant    |
 * | delete a notebook, change its grants     | yes   | owner   | 403    | owner        |
 * | read the mail outbox (own members' mail) | yes   | 403     | 403    | 403          |
 *
 * Analysts edit every notebook of their workspace, not only their own: a lab works on
 * shared notebooks, and every save is a new revision that can be restored.
 *
 * Notebook grants (notebook_access.role) add access to one notebook, also for people
 * outside its workspace (an outside reviewer): `owner` (the creator) edits and
 * manages; `editor` edits; `viewer` reads. The effective right is the larger of the
 * workspace right and the grant.
 *
 * Working together (runs, share links, publishing, forks, files out and in), by the
 * caller's effective notebook right from the two tables above:
 *
 * | Action                                         | edit | read only | cannot read        |
 * |------------------------------------------------|------|-----------|--------------------|
 * | list runs, read a run, compare runs, CSV       | yes  | yes       | 404                |
 * | start a run (POST .../runs)                    | yes  | 403       | 404                |
 * | make, list, revoke share links                 | yes  | 403       | 404                |
 * | publish, republish, unpublish                  | yes  | 403       | 404                |
 * | see the publication's settings                 | yes  | yes       | 404                |
 * | export (recordings: those the caller may read) | yes  | yes       | 404                |
 * | fork (into a workspace where they may create)  | yes  | yes       | 404                |
 *
 * Without any right on the notebook: a share link opens it read-only for anyone who
 * holds the token (members-only links: signed-out 401, signed-in non-members 404);
 * a signed-in token holder may fork it. A published page is public; its recordings
 * download only when the publisher allowed it. Import needs admin/analyst in the
 * target workspace, as creating a notebook does.
 *
 * Anything the caller cannot even read answers 404, never 403, so its existence does
 * not leak. 403 means "you can see it but not do this". 401 means "not signed in".
 */
export interface NotebookReach {
  workspaceRole: WorkspaceRole | null;
  grant: NotebookRole | null;
}

export type NotebookAction = 'read' | 'edit' | 'manage';

/** True when the workspace role allows the action on a notebook of that workspace. */
function workspaceAllows(role: WorkspaceRole | null, action: NotebookAction): boolean {
  if (role === 'admin') return true;
  if (role === 'analyst') return action !== 'manage';
  if (role === 'viewer') return action === 'read';
  return false;
}

function grantAllows(grant: NotebookRole | null, action: NotebookAction): boolean {
  if (grant === 'owner') return true;
  if (grant === 'editor') return action !== 'manage';
  if (grant === 'viewer') return action === 'read';
  return false;
}

export function notebookAllows(reach: NotebookReach, action: NotebookAction): boolean {
  return workspaceAllows(reach.workspaceRole, action) || grantAllows(reach.grant, action);
}

/** The caller's effective notebook role, as the API reports it. */
export function effectiveNotebookRole(reach: NotebookReach): NotebookRole {
  if (reach.grant === 'owner') return 'owner';
  return notebookAllows(reach, 'edit') ? 'editor' : 'viewer';
}

/** Throws 404 when the notebook is unreadable, 403 when readable but the action is not allowed. */
export function assertNotebook(reach: NotebookReach | undefined, action: NotebookAction): asserts reach is NotebookReach {
  if (!reach || !notebookAllows(reach, 'read')) throw notFound('Notebook');
  if (!notebookAllows(reach, action)) {
    const what = { read: 'read', edit: 'edit', manage: 'delete or share' }[action];
    throw forbidden(`Your role does not allow you to ${what} this notebook.`);
  }
}

export type WorkspaceAction = 'read' | 'manage-members' | 'create';

export function workspaceAllowsAction(role: WorkspaceRole, action: WorkspaceAction): boolean {
  if (action === 'read') return true;
  if (action === 'create') return role === 'admin' || role === 'analyst';
  return role === 'admin';
}

/** Throws 404 for non-members, 403 when the role does not allow the action. */
export function assertWorkspace(role: WorkspaceRole | undefined, action: WorkspaceAction): asserts role is WorkspaceRole {
  if (!role) throw notFound('Workspace');
  if (!workspaceAllowsAction(role, action)) {
    const what = { read: 'see this workspace', 'manage-members': 'manage members of this workspace', create: 'add notebooks or files to this workspace' }[action];
    throw forbidden(`Only ${action === 'create' ? 'admins and analysts' : 'admins'} may ${what}.`);
  }
}

/** Outbox: only someone who administers at least one workspace. */
export function assertOutboxReader(adminOfAny: boolean): void {
  if (!adminOfAny) throw new AppError(403, 'forbidden', 'Only workspace admins may read the outbox.');
}

/**
 * Opens a share link for a caller: a live link opens for anyone, a members-only link
 * only for a signed-in caller who could read the notebook anyway.
 */
export function assertShareOpens(share: { membersOnly: boolean } | undefined, caller: { signedIn: boolean; reach: NotebookReach | undefined }): void {
  if (!share) throw notFound('Share link');
  if (!share.membersOnly) return;
  if (!caller.signedIn) throw new AppError(401, 'unauthenticated', 'This link is for members of the workspace only. Sign in to open it.');
  if (!caller.reach || !notebookAllows(caller.reach, 'read')) throw notFound('Share link');
}

/** A published recording downloads only when the publisher allowed it and it is one of the publication's inputs. */
export function assertPublishedDownload(allowDownloads: boolean, isInput: boolean): void {
  if (!allowDownloads || !isInput) throw notFound('File');
}
