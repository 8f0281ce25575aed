'use server';

import { revalidatePath } from 'next/cache';
import { createApiToken, revokeApiToken, type TokenScope } from '@/db/queries/api-tokens';
import { createInvitation, revokeInvitation } from '@/db/queries/invitations';
import { changeMemberRole, listMembers, removeMember, type MemberChange } from '@/db/queries/members';
import { formAction } from '@/lib/server/auth/action';
import { can } from '@/lib/auth/permissions';
import { getEnv } from '@/lib/env';
import { AppError, notFound } from '@/lib/errors';
import { sendMail } from '@/lib/server/mail/transport';
import { invitationMail } from '@/lib/server/mail/templates';
import { apiTokenCreateSchema, idOnlySchema, invitationCreateSchema, memberRemoveSchema, memberRoleSchema } from '@/lib/schemas/team';

function memberOutcome(r: MemberChange): void {
  if (r === 'not-found') throw notFound('No such member');
  if (r === 'last-admin') throw new AppError(409, 'A lab needs at least one admin: make someone else admin first.', 'last_admin');
}

export const inviteMemberAction = formAction('invitation.manage', invitationCreateSchema, async (actor, input) => {
  const members = await listMembers(actor.labId);
  if (members.some((m) => m.email.toLowerCase() === input.email)) throw new AppError(409, `${input.email} is already a member of this lab`, 'member_exists', { email: ['Already a member of this lab'] });
  const { token } = await createInvitation(actor.labId, actor.user.id, input.email, input.role);
  const link = `${getEnv().NEXTAUTH_URL}/invite/${token}`;
  try {
    await sendMail(invitationMail(input.email, actor.labName, input.role, actor.user.name, link));
  } catch {
    throw new AppError(502, 'The invitation was saved but the mail could not be sent. Check the mail settings and invite again.', 'mail_failed');
  }
  revalidatePath('/settings/invitations');
  return `Invitation sent to ${input.email}`;
});

export const revokeInvitationAction = formAction('invitation.manage', idOnlySchema, async (actor, input) => {
  if (!(await revokeInvitation(actor.labId, actor.user.id, input.id))) throw notFound('No such pending invitation');
  revalidatePath('/settings/invitations');
  return 'Invitation withdrawn';
});

export const changeRoleAction = formAction('member.manage', memberRoleSchema, async (actor, input) => {
  memberOutcome(await changeMemberRole(actor.labId, actor.user.id, input.userId, input.role));
  revalidatePath('/settings');
  return 'Role changed';
});

export const removeMemberAction = formAction('member.manage', memberRemoveSchema, async (actor, input) => {
  memberOutcome(await removeMember(actor.labId, actor.user.id, input.userId));
  revalidatePath('/settings');
  return 'Member removed';
});

export const createTokenAction = formAction('token.self', apiTokenCreateSchema, async (actor, input) => {
  const scopes: TokenScope[] = [];
  if (input.scopeRead) scopes.push('read');
  if (input.scopeCapture) scopes.push('capture:write');
  if (input.scopeDelete) scopes.push('capture:delete');
  if (input.scopeExport) scopes.push('export');
  if (!scopes.length) throw new AppError(422, 'Choose at least one scope', 'invalid', { scopes: ['Choose at least one scope'] });
  const { token } = await createApiToken(actor.labId, actor.user.id, input.name, scopes);
  revalidatePath('/settings/tokens');
  return { message: 'Copy the token now: it is shown only once.', secret: token };
});

export const revokeTokenAction = formAction('token.self', idOnlySchema, async (actor, input) => {
  if (!(await revokeApiToken(actor.labId, actor.user.id, input.id, can(actor.role, 'token.manage')))) throw notFound('No such active token');
  revalidatePath('/settings/tokens');
  return 'Token revoked';
});
