import type { WorkspaceRole } from '../../../shared/api/workspaces.js';

/** Role choices with what each one may do, in the words the team pages use. */
export const roleOptions: Array<{ value: WorkspaceRole; label: string; title: string }> = [
  { value: 'admin', label: 'Admin', title: 'Manages members and every notebook' },
  { value: 'analyst', label: 'Analyst', title: 'Creates and edits notebooks' },
  { value: 'viewer', label: 'Viewer', title: 'Reads notebooks' },
];
