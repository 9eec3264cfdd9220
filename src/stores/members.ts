// The organization's members, as its administrators manage them: the list, adding (a removed
// member comes back the same way), roles, unlocking, a new password, removing. Every change
// reloads the list, so what is shown is what the server holds.
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Member, MemberCreate } from '@shared/api/users';
import type { Role } from '@shared/api/roles';
import * as membersApi from '@/api/members';
import { ApiError } from '@/api/api-error';

const messageOf = (e: unknown) => (e instanceof ApiError ? e.message : String(e));

export const useMembersStore = defineStore('members', () => {
  const members = ref<Member[]>([]);
  const loading = ref(false);
  // The last failed list change, for the page's alert ('' when none).
  const error = ref('');

  async function load() {
    loading.value = true;
    try {
      members.value = await membersApi.listMembers();
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
  }

  /** Runs one change; a refusal becomes `error`, and the list is read again either way. */
  async function change(call: () => Promise<unknown>): Promise<boolean> {
    error.value = '';
    let ok = true;
    try {
      await call();
    } catch (e) {
      error.value = messageOf(e);
      ok = false;
    }
    await load();
    return ok;
  }

  const changeRole = (userId: string, role: Role) => change(() => membersApi.updateMemberRole(userId, role));
  const unlock = (userId: string) => change(() => membersApi.unlockMember(userId));
  const remove = (userId: string) => change(() => membersApi.removeMember(userId));

  // The dialogs show their own refusals under their fields: these throw, and reload on success.
  async function add(input: MemberCreate): Promise<Member> {
    const member = await membersApi.createMember(input);
    await load();
    return member;
  }

  async function setPassword(userId: string, password: string): Promise<Member> {
    const member = await membersApi.setMemberPassword(userId, password);
    await load();
    return member;
  }

  const clearError = () => (error.value = '');

  return { members, loading, error, load, changeRole, unlock, remove, add, setPassword, clearError };
});
