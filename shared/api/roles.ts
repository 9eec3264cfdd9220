// Roles are per organization. What each may do is decided here, once, for server and client.
import { z } from 'zod';

export const roleSchema = z.enum(['admin', 'planner', 'official', 'viewer']);
export type Role = z.infer<typeof roleSchema>;

export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  planner: 'Planner',
  official: 'Official',
  viewer: 'Viewer',
};

// 'briefings:read-drafts': see and download briefings before they are signed (viewers see signed ones only).
export type Permission = 'plans:read' | 'plans:write' | 'users:manage' | 'briefings:sign' | 'briefings:read-drafts';

const permissions: Record<Role, readonly Permission[]> = {
  admin: ['plans:read', 'plans:write', 'users:manage', 'briefings:read-drafts'],
  planner: ['plans:read', 'plans:write', 'briefings:read-drafts'],
  official: ['plans:read', 'briefings:sign', 'briefings:read-drafts'],
  viewer: ['plans:read'],
};

export function can(role: Role, permission: Permission): boolean {
  return permissions[role].includes(permission);
}
