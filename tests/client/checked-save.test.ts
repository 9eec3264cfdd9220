// The Save step shared by record and settings forms: a failed check sends nothing and shows the
// field errors; a send is busy while it lasts; a refusal becomes the form's error.
import { describe, expect, it, vi } from 'vitest';
import { ApiError } from '../../src/api/api-error';
import { useCheckedSave } from '../../src/composables/use-checked-save';
import type { ParseResult } from '../../src/forms/zod-errors';

const positive = (v: { n: number }): ParseResult<number> => (v.n > 0 ? { ok: true, value: v.n } : { ok: false, errors: { n: 'Enter a positive number.' } });

describe('checked save', () => {
  it('sends nothing when the check fails, and shows its field errors', async () => {
    const send = vi.fn(async () => {});
    const form = useCheckedSave(positive, send);
    expect(await form.save({ n: 0 })).toBe(false);
    expect(send).not.toHaveBeenCalled();
    expect(form.errors.value).toEqual({ n: 'Enter a positive number.' });
  });

  it('sends the checked value, busy while it lasts, and clears the old errors', async () => {
    let release!: () => void;
    const send = vi.fn((_: number) => new Promise<void>((r) => (release = r)));
    const form = useCheckedSave(positive, send);
    await form.save({ n: -1 });
    const saving = form.save({ n: 3 });
    expect(form.busy.value).toBe(true);
    expect(form.errors.value).toEqual({});
    release();
    expect(await saving).toBe(true);
    expect(send).toHaveBeenCalledWith(3);
    expect(form.busy.value).toBe(false);
  });

  it('shows a refusal as the form error and reports it was not saved', async () => {
    const form = useCheckedSave(positive, async () => {
      throw new Error('Only administrators can change this.');
    });
    expect(await form.save({ n: 2 })).toBe(false);
    expect(form.errors.value.form).toContain('Only administrators can change this.');
    expect(form.busy.value).toBe(false);
  });

  it("puts the server's messages for single fields under those fields", async () => {
    const form = useCheckedSave(positive, async () => {
      throw new ApiError(400, 'invalid_request', 'Check the highlighted fields.', [{ path: 'title', message: 'A title is needed.' }]);
    });
    await form.save({ n: 1 });
    expect(form.errors.value).toEqual({ form: 'Check the highlighted fields.', title: 'A title is needed.' });
  });
});
