// The signed-in person's own account: changing their password (the current one required).
import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { OwnPasswordChange } from '@shared/api/users';
import * as authApi from '@/api/auth';

export const useAccountStore = defineStore('account', () => {
  // When this browser last changed the password, for the page's confirmation.
  const passwordChangedAt = ref<Date | null>(null);

  /** Throws the server's refusal (a wrong current password comes under `currentPassword`). */
  async function changePassword(input: OwnPasswordChange): Promise<void> {
    await authApi.changeOwnPassword(input);
    passwordChangedAt.value = new Date();
  }

  return { passwordChangedAt, changePassword };
});
