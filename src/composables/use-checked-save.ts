// The step every form's Save takes: check the values (field errors shown, nothing sent), then send
// them with the busy flag up, and show a refusal as the form's error. Record forms and settings
// forms differ only in where the values come from and what sending means.
import { ref } from 'vue';
import type { FieldErrors, ParseResult } from '@/forms/zod-errors';
import { messageOf } from '@/format/error-message';

export function useCheckedSave<V, I>(check: (values: V) => ParseResult<I>, send: (input: I) => Promise<void>) {
  const errors = ref<FieldErrors>({});
  const busy = ref(false);

  /** True when the values passed the check and were accepted. */
  async function save(values: V): Promise<boolean> {
    const checked = check(values);
    if (!checked.ok) {
      errors.value = checked.errors;
      return false;
    }
    errors.value = {};
    busy.value = true;
    try {
      await send(checked.value);
      return true;
    } catch (e) {
      errors.value = { form: messageOf(e) };
      return false;
    } finally {
      busy.value = false;
    }
  }

  return { errors, busy, save };
}
