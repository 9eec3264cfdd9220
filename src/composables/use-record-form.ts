// The save half of a zone or shelter form: the form's values (from the record, or fresh for a new
// one, and again whenever the record changes), the field errors, the busy flag, and saving
// (checked first; created or updated; a refusal shown as the form's error).
import { ref, watch, type Ref } from 'vue';
import type { FieldErrors } from '@/forms/zod-errors';
import { messageOf } from '@/format/error-message';

type Checked<I> = { ok: true; value: I } | { ok: false; errors: FieldErrors };

export function useRecordForm<R extends { id: number }, V, I>(options: {
  record: () => R | null;
  valuesOf: (record: R) => V;
  fresh: () => V;
  check: (values: V) => Checked<I>;
  create: (input: I) => Promise<R>;
  update: (id: number, input: I) => Promise<R>;
  saved: (record: R) => void;
}) {
  const initial = options.record();
  const form = ref(initial ? options.valuesOf(initial) : options.fresh()) as Ref<V>;
  const errors = ref<FieldErrors>({});
  const busy = ref(false);
  watch(options.record, (record) => {
    form.value = record ? options.valuesOf(record) : options.fresh();
    errors.value = {};
  });

  async function save() {
    const checked = options.check(form.value);
    if (!checked.ok) {
      errors.value = checked.errors;
      return;
    }
    errors.value = {};
    busy.value = true;
    try {
      const record = options.record();
      options.saved(record ? await options.update(record.id, checked.value) : await options.create(checked.value));
    } catch (e) {
      errors.value = { form: messageOf(e) };
    } finally {
      busy.value = false;
    }
  }

  return { form, errors, busy, save };
}
