// Who is signed in, in which organization and role.
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { SessionUser, SignInRequest } from '@shared/api/auth';
import { can, type Permission } from '@shared/api/roles';
import * as authApi from '@/api/auth';

export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null);
  const loaded = ref(false);

  const signedIn = computed(() => user.value !== null);
  const organizationName = computed(
    () => user.value?.memberships.find((m) => m.organizationId === user.value?.organizationId)?.organizationName ?? '',
  );

  function allows(permission: Permission): boolean {
    return user.value !== null && can(user.value.role, permission);
  }

  async function load() {
    user.value = (await authApi.fetchSession()).user;
    loaded.value = true;
  }

  async function signIn(input: SignInRequest) {
    user.value = (await authApi.signIn(input)).user;
  }

  async function signOut() {
    user.value = (await authApi.signOut()).user;
  }

  async function switchOrganization(organizationId: string) {
    user.value = (await authApi.switchOrganization(organizationId)).user;
  }

  return { user, loaded, signedIn, organizationName, allows, load, signIn, signOut, switchOrganization };
});
