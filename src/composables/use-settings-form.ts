// A settings form (one stored value set, no records to create): the values load once, before the
// form shows, so nothing typed is overwritten; Save goes through the shared checked-save step and
// says when it was accepted.
import { onMounted, ref, type Ref } from 'vue';
import type { ParseResult } from '@/forms/zod-errors';
import { useCheckedSave } from './use-checked-save';

export function useSettingsForm<V, I>(options: {
  load: () => Promise<V>;
  /** Placeholder values until the stored ones are in. */
  initial: V;
  check: (values: V) => ParseResult<I>;
  send: (input: I) => Promise<void>;
}) {
  const form = ref(options.initial) as Ref<V>;
  const ready = ref(false);
  const saved = ref(false);
  const { errors, busy, save: saveValues } = useCheckedSave(options.check, options.send);

  onMounted(async () => {
    form.value = await options.load();
    ready.value = true;
  });

  async function save() {
    saved.value = false;
    saved.value = await saveValues(form.value);
  }

  return { form, errors, busy, saved, ready, save };
}
