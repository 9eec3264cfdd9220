// What the client lets each role do follows shared/api/roles.ts, the same table the server uses.
import { beforeEach, describe, expect, it } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { useSessionStore } from '../../src/stores/session';
import type { Role } from '../../shared/api/roles';

function userWith(role: Role) {
  const organizationId = '00000000-0000-4000-8000-000000000001';
  return {
    id: '00000000-0000-4000-8000-000000000002',
    email: 'a@cutline.example',
    displayName: 'A',
    memberships: [{ organizationId, organizationName: 'Org', role }],
    organizationId,
    role,
  };
}

beforeEach(() => setActivePinia(createPinia()));

describe('session store', () => {
  it.each([
    ['admin', true, true],
    ['planner', true, false],
    ['official', false, false],
    ['viewer', false, false],
  ] as const)('%s: edit plans %s, manage users %s', (role, write, manage) => {
    const store = useSessionStore();
    store.user = userWith(role);
    expect(store.allows('plans:read')).toBe(true);
    expect(store.allows('plans:write')).toBe(write);
    expect(store.allows('users:manage')).toBe(manage);
    expect(store.organizationName).toBe('Org');
  });

  it('allows nothing when signed out', () => {
    expect(useSessionStore().allows('plans:read')).toBe(false);
  });
});
