import { z } from 'zod';
import { memberListSchema, memberSchema, type MemberCreate } from '@shared/api/users';
import type { Role } from '@shared/api/roles';
import { request } from './http';

export const listMembers = async () => (await request('GET', '/members', memberListSchema)).members;
export const createMember = (input: MemberCreate) => request('POST', '/members', memberSchema, input);
export const updateMemberRole = (userId: string, role: Role) => request('PATCH', `/members/${userId}`, memberSchema, { role });
export const unlockMember = (userId: string) => request('POST', `/members/${userId}/unlock`, memberSchema);
export const setMemberPassword = (userId: string, password: string) => request('POST', `/members/${userId}/password`, memberSchema, { password });
export const removeMember = (userId: string) => request('DELETE', `/members/${userId}`, z.undefined());
