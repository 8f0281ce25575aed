import { describe, expect, it } from 'vitest';
import { can, PERMISSIONS, ROLE_PERMISSIONS, ROLES } from '../../../lib/auth/permissions';

describe('the permission table', () => {
  it('gives each role everything the role below it has (docs/method.md §2)', () => {
    const order = ['viewer', 'tester', 'lead', 'admin'] as const;
    for (let i = 1; i < order.length; i++) {
      for (const p of ROLE_PERMISSIONS[order[i - 1]!]) expect(can(order[i]!, p), `${order[i]} ${p}`).toBe(true);
    }
  });

  it('keeps viewers read-only', () => {
    for (const p of ROLE_PERMISSIONS.viewer) expect(p).toMatch(/\.read$/);
  });

  it('lets only admins manage members, invitations and deletions', () => {
    for (const p of ['member.manage', 'invitation.manage', 'project.delete', 'capture.delete', 'audit.read'] as const) {
      expect(ROLES.filter((r) => can(r, p))).toEqual(['admin']);
    }
  });

  it('names only known permissions', () => {
    for (const r of ROLES) for (const p of ROLE_PERMISSIONS[r]) expect(PERMISSIONS).toContain(p);
  });
});
