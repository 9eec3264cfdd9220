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

export type Permission = 'plans:read' | 'plans:write' | 'users:manage' | 'briefings:sign';

const permissions: Record<Role, readonly Permission[]> = {
  admin: ['plans:read', 'plans:write', 'users:manage'],
  planner: ['plans:read', 'plans:write'],
  official: ['plans:read', 'briefings:sign'],
  viewer: ['plans:read'],
};

export function can(role: Role, permission: Permission): boolean {
  return permissions[role].includes(permission);
}
