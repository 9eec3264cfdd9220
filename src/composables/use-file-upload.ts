// One file picked and sent: the hidden input, the busy flag, the success message the caller words,
// and for a refused file its message and the first of its bad features. Used by the zone and
// shelter lists (WorkspaceListTab.vue).
import { ref } from 'vue';
import { ApiError } from '@/api/api-error';
import { badFeatureLines } from '@/format/import-report';
import { messageOf } from '@/format/error-message';

/** `send` uploads the file and answers the words to show when it worked; it may report what the
 *  server is doing meanwhile (an import job's phase) through `progress`. */
/** `ask`, when given, runs first (the field-mapping step): it answers the options to send with the
 *  file, or null when the planner cancels, and nothing is sent. */
export function useFileUpload<O = undefined>(
  send: (file: File, progress: (text: string) => void, options?: O) => Promise<string>,
  ask?: (file: File) => Promise<O | null>,
) {
  const input = ref<HTMLInputElement | null>(null);
  const message = ref('');
  const error = ref('');
  // A refused file names its bad features; the first few are listed under the message.
  const problems = ref<string[]>([]);
  const busy = ref(false);
  // What the server is doing with the file while busy ('' when nothing is reported).
  const progress = ref('');

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
    progress.value = '';
    try {
      let options: O | undefined;
      if (ask) {
        const answer = await ask(file);
        if (answer === null) return;
        options = answer;
      }
      message.value = await send(file, (text) => (progress.value = text), options);
    } catch (e) {
      error.value = messageOf(e);
      problems.value = e instanceof ApiError && e.importFailure ? badFeatureLines(e.importFailure.badFeatures) : [];
    } finally {
      busy.value = false;
      progress.value = '';
    }
  }

  return { input, message, error, problems, busy, progress, choose, picked };
}
