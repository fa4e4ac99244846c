import { Router } from 'express';
import { idParamsSchema } from '../../shared/api/common.js';
import { createInvitationBodySchema, invitationParamsSchema } from '../../shared/api/invitations.js';
import { addMemberBodySchema, memberParamsSchema, updateMemberBodySchema } from '../../shared/api/workspaces.js';
import type { AppContext } from '../context.js';
import { userIdOf } from '../middleware/session.js';
import * as invitations from '../services/invitations.js';
import * as workspaces from '../services/workspaces.js';

export function workspaceRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  const mail = { mailer: ctx.mailer, baseUrl: ctx.config.baseUrl };
  router.get('/', async (_req, res) => {
    res.json({ workspaces: await workspaces.listWorkspaces(db, userIdOf(res)) });
  });
  router.get('/:id/members', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json({ members: await workspaces.listMembers(db, userIdOf(res), id) });
  });
  router.post('/:id/members', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.status(201).json(await workspaces.addMember(db, userIdOf(res), id, addMemberBodySchema.parse(req.body)));
  });
  router.patch('/:id/members/:userId', async (req, res) => {
    const { id, userId } = memberParamsSchema.parse(req.params);
    const { role } = updateMemberBodySchema.parse(req.body);
    res.json(await workspaces.updateMember(db, userIdOf(res), id, userId, role));
  });
  router.delete('/:id/members/:userId', async (req, res) => {
    const { id, userId } = memberParamsSchema.parse(req.params);
    await workspaces.removeMember(db, userIdOf(res), id, userId);
    res.status(204).end();
  });
  router.post('/:id/invitations', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const body = createInvitationBodySchema.parse(req.body);
    res.status(201).json(await invitations.createInvitation(db, mail, userIdOf(res), id, body));
  });
  router.get('/:id/invitations', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json({ invitations: await invitations.listInvitations(db, userIdOf(res), id) });
  });
  router.delete('/:id/invitations/:invitationId', async (req, res) => {
    const { id, invitationId } = invitationParamsSchema.parse(req.params);
    await invitations.revokeInvitation(db, userIdOf(res), id, invitationId);
    res.status(204).end();
  });
  return router;
}
