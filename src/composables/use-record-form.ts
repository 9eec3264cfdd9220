// The save half of a zone or shelter form: the form's values (from the record, or fresh for a new
// one, and again whenever the record changes), and saving it (created or updated) through the
// shared checked-save step.
import { ref, watch, type Ref } from 'vue';
import type { ParseResult } from '@/forms/zod-errors';
import { useCheckedSave } from './use-checked-save';

export function useRecordForm<R extends { id: number }, V, I>(options: {
  record: () => R | null;
  valuesOf: (record: R) => V;
  fresh: () => V;
  check: (values: V) => ParseResult<I>;
  create: (input: I) => Promise<R>;
  update: (id: number, input: I) => Promise<R>;
  saved: (record: R) => void;
}) {
  const initial = options.record();
  const form = ref(initial ? options.valuesOf(initial) : options.fresh()) as Ref<V>;
  const { errors, busy, save: saveValues } = useCheckedSave(options.check, async (input: I) => {
    const record = options.record();
    options.saved(record ? await options.update(record.id, input) : await options.create(input));
  });
  watch(options.record, (record) => {
    form.value = record ? options.valuesOf(record) : options.fresh();
    errors.value = {};
  });

  return { form, errors, busy, save: () => saveValues(form.value) };
}
