// Roles as data: every page, action and route handler asks this table.
export const ROLES = ['admin', 'lead', 'tester', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'lab.read',
  'project.read',
  'project.write',
  'project.delete',
  'revision.write',
  'stack.write',
  'target.write',
  'capture.read',
  'capture.write',
  'capture.delete',
  'analysis.run',
  'compare.read',
  'export.create',
  'template.write',
  'token.self',
  'token.manage',
  'member.manage',
  'invitation.manage',
  'camera.write',
  'audit.read',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const VIEWER: Permission[] = ['lab.read', 'project.read', 'capture.read', 'compare.read'];
const TESTER: Permission[] = [...VIEWER, 'capture.write', 'analysis.run', 'export.create', 'template.write', 'token.self'];
const LEAD: Permission[] = [...TESTER, 'project.write', 'revision.write', 'stack.write', 'target.write'];
const ADMIN: Permission[] = [...PERMISSIONS];

export const ROLE_PERMISSIONS: Record<Role, ReadonlySet<Permission>> = {
  admin: new Set(ADMIN),
  lead: new Set(LEAD),
  tester: new Set(TESTER),
  viewer: new Set(VIEWER),
};

export function can(role: Role, permission: Permission): boolean {
  return ROLE_PERMISSIONS[role].has(permission);
}

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  lead: 'Lead',
  tester: 'Tester',
  viewer: 'Viewer',
};
