// The members and account screens' logic: the members store (list, changes that reload it,
// refusals shown, a new password for a member), the account store's own password change, and
// the password forms' checks against the server's own rules before anything is sent.
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { Member } from '../../shared/api/users';
import { ApiError } from '../../src/api/api-error';

vi.mock('../../src/api/members', () => ({
  listMembers: vi.fn(),
  createMember: vi.fn(),
  updateMemberRole: vi.fn(),
  unlockMember: vi.fn(),
  setMemberPassword: vi.fn(),
  removeMember: vi.fn(),
}));
vi.mock('../../src/api/auth', () => ({ changeOwnPassword: vi.fn() }));
const membersApi = await import('../../src/api/members');
const authApi = await import('../../src/api/auth');
const { useMembersStore } = await import('../../src/stores/members');
const { useAccountStore } = await import('../../src/stores/account');
const { validateOwnPasswordChange, validatePasswordReset } = await import('../../src/forms/password-form');

const member = (name: string, lockedUntil: string | null = null): Member => ({
  userId: `00000000-0000-4000-8000-00000000000${name.length % 10}`,
  email: `${name.toLowerCase()}@veltmoor.example`,
  displayName: name,
  role: 'planner',
  joinedAt: '2026-01-05T09:00:00.000Z',
  lockedUntil,
});

beforeEach(() => {
  setActivePinia(createPinia());
  vi.clearAllMocks();
});

describe('members store', () => {
  it('sets a member’s password and reads the list again', async () => {
    const locked = member('Orla', '2026-01-05T10:00:00.000Z');
    vi.mocked(membersApi.listMembers).mockResolvedValueOnce([locked]).mockResolvedValueOnce([{ ...locked, lockedUntil: null }]);
    vi.mocked(membersApi.setMemberPassword).mockResolvedValue({ ...locked, lockedUntil: null });
    const store = useMembersStore();
    await store.load();
    expect(store.members[0]!.lockedUntil).not.toBeNull();
    await store.setPassword(locked.userId, 'harbour-gate-2026');
    expect(membersApi.setMemberPassword).toHaveBeenCalledWith(locked.userId, 'harbour-gate-2026');
    expect(store.members[0]!.lockedUntil).toBeNull();
  });

  it('passes a refused new password to the dialog, leaving the page’s alert alone', async () => {
    vi.mocked(membersApi.setMemberPassword).mockRejectedValue(new ApiError(409, 'conflict', 'This person also belongs to another organization, so only they can change their password.'));
    const store = useMembersStore();
    await expect(store.setPassword(member('Orla').userId, 'harbour-gate-2026')).rejects.toThrow(/another organization/);
    expect(store.error).toBe('');
    expect(membersApi.listMembers).not.toHaveBeenCalled();
  });

  it('shows a refused role change or removal and reloads the list', async () => {
    vi.mocked(membersApi.listMembers).mockResolvedValue([member('Orla')]);
    vi.mocked(membersApi.removeMember).mockRejectedValue(new ApiError(409, 'conflict', 'An organization needs at least one administrator.'));
    const store = useMembersStore();
    expect(await store.remove(member('Orla').userId)).toBe(false);
    expect(store.error).toBe('An organization needs at least one administrator.');
    expect(membersApi.listMembers).toHaveBeenCalledTimes(1);
    expect(await store.changeRole(member('Orla').userId, 'viewer')).toBe(true);
    expect(store.error).toBe('');
  });

  it('adds a member (a returning one the same way) and reloads', async () => {
    const back = member('Tamsin');
    vi.mocked(membersApi.createMember).mockResolvedValue(back);
    vi.mocked(membersApi.listMembers).mockResolvedValue([back]);
    const store = useMembersStore();
    await store.add({ email: back.email, displayName: back.displayName, role: 'planner', password: 'lantern-quay-2026' });
    expect(store.members).toEqual([back]);
  });
});

describe('account store', () => {
  it('changes the password and remembers that it did', async () => {
    vi.mocked(authApi.changeOwnPassword).mockResolvedValue(undefined);
    const account = useAccountStore();
    expect(account.passwordChangedAt).toBeNull();
    await account.changePassword({ currentPassword: 'old-password-2026', newPassword: 'new-password-2026' });
    expect(authApi.changeOwnPassword).toHaveBeenCalledWith({ currentPassword: 'old-password-2026', newPassword: 'new-password-2026' });
    expect(account.passwordChangedAt).toBeInstanceOf(Date);
  });

  it('passes a wrong current password on, unchanged', async () => {
    vi.mocked(authApi.changeOwnPassword).mockRejectedValue(
      new ApiError(400, 'invalid_request', 'That is not your current password.', [{ path: 'currentPassword', message: 'That is not your current password.' }]),
    );
    const account = useAccountStore();
    await expect(account.changePassword({ currentPassword: 'x', newPassword: 'new-password-2026' })).rejects.toMatchObject({ fields: [{ path: 'currentPassword' }] });
    expect(account.passwordChangedAt).toBeNull();
  });
});

describe('password forms', () => {
  it('asks for the new password twice, the same both times', () => {
    expect(validateOwnPasswordChange({ currentPassword: 'old-password-2026', newPassword: 'new-password-2026', repeat: 'new-password-2062' })).toEqual({
      ok: false,
      errors: { repeat: 'The two passwords differ.' },
    });
    expect(validatePasswordReset({ password: 'new-password-2026', repeat: 'new-password-2026' })).toEqual({ ok: true, value: { password: 'new-password-2026' } });
  });

  it('applies the server’s password rules and refuses the current password again', () => {
    const short = validatePasswordReset({ password: 'short1', repeat: 'short1' });
    expect(short.ok ? {} : short.errors).toEqual({ password: 'Use at least 12 characters.' });
    const letters = validateOwnPasswordChange({ currentPassword: 'old-password-2026', newPassword: 'onlylettershere', repeat: 'onlylettershere' });
    expect(letters.ok ? {} : letters.errors).toEqual({ newPassword: 'Mix letters with digits or symbols.' });
    const same = validateOwnPasswordChange({ currentPassword: 'old-password-2026', newPassword: 'old-password-2026', repeat: 'old-password-2026' });
    expect(same.ok ? {} : same.errors).toEqual({ newPassword: 'Choose a password other than the current one.' });
    const missing = validateOwnPasswordChange({ currentPassword: '', newPassword: 'new-password-2026', repeat: 'new-password-2026' });
    expect(missing.ok ? {} : missing.errors).toEqual({ currentPassword: 'Enter your current password.' });
  });
});
