// The step every form's Save takes: check the values (field errors shown, nothing sent), then send
// them with the busy flag up, and show a refusal as the form's error, with the server's messages
// for single fields under those fields. Record forms, settings forms and dialogs differ only in
// where the values come from and what sending means.
import { ref } from 'vue';
import { ApiError } from '@/api/api-error';
import type { FieldErrors, ParseResult } from '@/forms/zod-errors';
import { messageOf } from '@/format/error-message';

function refusalErrors(e: unknown): FieldErrors {
  const fields = e instanceof ApiError ? Object.fromEntries(e.fields.map((f) => [f.path, f.message])) : {};
  return { form: messageOf(e), ...fields };
}

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
      errors.value = refusalErrors(e);
      return false;
    } finally {
      busy.value = false;
    }
  }

  return { errors, busy, save };
}
