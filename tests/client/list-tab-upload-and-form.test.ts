// The zone and shelter tabs' shared pieces: the upload composable (the success words, a refused
// file's message and bad features, the input cleared for the next pick) and the record form
// (checked before saving, created or updated, a refusal shown as the form's error).
import { describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import { ApiError } from '../../src/api/api-error';
import { useFileUpload } from '../../src/composables/use-file-upload';
import { useRecordForm } from '../../src/composables/use-record-form';

function pickEvent(file: File | null) {
  const target = { files: file ? [file] : [], value: 'C:\\fakepath\\zones.geojson' };
  return { event: { target } as unknown as Event, target };
}

describe('useFileUpload', () => {
  it('sends the picked file, shows the caller\'s words and clears the input', async () => {
    const send = vi.fn(async (file: File) => `2 zones added from ${file.name}.`);
    const upload = useFileUpload(send);
    const { event, target } = pickEvent(new File(['{}'], 'zones.geojson'));
    const done = upload.picked(event);
    expect(upload.busy.value).toBe(true);
    await done;
    expect(send).toHaveBeenCalledTimes(1);
    expect(upload.message.value).toBe('2 zones added from zones.geojson.');
    expect(upload.error.value).toBe('');
    expect(upload.busy.value).toBe(false);
    expect(target.value).toBe('');
  });

  it('shows a refused file\'s message and its bad features, and drops the last success', async () => {
    const refusal = new ApiError(400, 'invalid_request', '2 features are malformed.', [], {
      code: 'badFeatures',
      message: '2 features are malformed.',
      badFeatures: [
        { index: 3, id: 'z-4', problem: 'no coordinates' },
        { index: 7, id: null, problem: 'not a polygon' },
      ],
    } as never);
    let call = 0;
    const upload = useFileUpload(async () => {
      if (call++ === 0) return 'fine';
      throw refusal;
    });
    await upload.picked(pickEvent(new File(['{}'], 'a.geojson')).event);
    await upload.picked(pickEvent(new File(['{}'], 'b.geojson')).event);
    expect(upload.message.value).toBe('');
    expect(upload.error.value).toBe('2 features are malformed.');
    expect(upload.problems.value).toEqual(['Feature 4 (z-4): no coordinates', 'Feature 8: not a polygon']);
  });

  it('does nothing when no file was picked', async () => {
    const send = vi.fn(async () => 'never');
    const upload = useFileUpload(send);
    await upload.picked(pickEvent(null).event);
    expect(send).not.toHaveBeenCalled();
  });
});

describe('useRecordForm', () => {
  type Rec = { id: number; name: string };
  const setup = (record: { value: Rec | null }) => {
    const create = vi.fn(async (input: { name: string }) => ({ id: 9, ...input }));
    const update = vi.fn(async (id: number, input: { name: string }) => ({ id, ...input }));
    const saved = vi.fn();
    const form = useRecordForm({
      record: () => record.value,
      valuesOf: (r: Rec) => ({ name: r.name }),
      fresh: () => ({ name: 'Zone 1' }),
      check: (v: { name: string }) => (v.name.trim() ? { ok: true as const, value: { name: v.name.trim() } } : { ok: false as const, errors: { name: 'Give it a name.' } }),
      create,
      update,
      saved,
    });
    return { form, create, update, saved };
  };

  it('refuses values that do not pass, creates a new record and updates an existing one', async () => {
    const fresh = setup({ value: null });
    expect(fresh.form.form.value).toEqual({ name: 'Zone 1' });
    fresh.form.form.value.name = '  ';
    await fresh.form.save();
    expect(fresh.form.errors.value).toEqual({ name: 'Give it a name.' });
    expect(fresh.create).not.toHaveBeenCalled();
    fresh.form.form.value.name = ' North ';
    await fresh.form.save();
    expect(fresh.create).toHaveBeenCalledWith({ name: 'North' });
    expect(fresh.saved).toHaveBeenCalledWith({ id: 9, name: 'North' });
    expect(fresh.form.errors.value).toEqual({});

    const existing = setup({ value: { id: 4, name: 'Harbour' } });
    expect(existing.form.form.value).toEqual({ name: 'Harbour' });
    await existing.form.save();
    expect(existing.update).toHaveBeenCalledWith(4, { name: 'Harbour' });
    expect(existing.create).not.toHaveBeenCalled();
  });

  it('shows a refusal from the server as the form\'s error', async () => {
    const { form, create } = setup({ value: null });
    create.mockRejectedValueOnce(new ApiError(409, 'conflict', 'A zone of that name exists.'));
    await form.save();
    expect(form.errors.value).toEqual({ form: 'A zone of that name exists.' });
    expect(form.busy.value).toBe(false);
    await nextTick();
  });
});
