// One file picked and sent: the hidden input, the busy flag, the success message the caller words,
// and for a refused file its message and the first of its bad features. Used by the zone and
// shelter lists (WorkspaceListTab.vue).
import { ref } from 'vue';
import { ApiError } from '@/api/api-error';
import { badFeatureLines } from '@/format/import-report';
import { messageOf } from '@/format/error-message';

/** `send` uploads the file and answers the words to show when it worked. */
export function useFileUpload(send: (file: File) => Promise<string>) {
  const input = ref<HTMLInputElement | null>(null);
  const message = ref('');
  const error = ref('');
  // A refused file names its bad features; the first few are listed under the message.
  const problems = ref<string[]>([]);
  const busy = ref(false);

  function choose() {
    input.value?.click();
  }

  async function picked(event: Event) {
    const target = event.target as HTMLInputElement;
    const file = target.files?.[0];
    target.value = '';
    if (!file) return;
    message.value = '';
    error.value = '';
    problems.value = [];
    busy.value = true;
    try {
      message.value = await send(file);
    } catch (e) {
      error.value = messageOf(e);
      problems.value = e instanceof ApiError && e.importFailure ? badFeatureLines(e.importFailure.badFeatures) : [];
    } finally {
      busy.value = false;
    }
  }

  return { input, message, error, problems, busy, choose, picked };
}
