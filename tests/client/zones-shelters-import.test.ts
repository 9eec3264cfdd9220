// The zone and shelter uploads go through import jobs: the store sends the file as an import of
// its kind, passes the server's phase on while the job runs, then reads the list again and
// answers how many were added; a refused file's error reaches the caller and changes no list.
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { ApiError } from '../../src/api/api-error';

vi.mock('../../src/api/imports', () => ({ importFile: vi.fn(), getImport: vi.fn(), cancelImport: vi.fn() }));
vi.mock('../../src/api/zones', () => ({ listZones: vi.fn(), createZone: vi.fn(), updateZone: vi.fn(), deleteZone: vi.fn() }));
vi.mock('../../src/api/shelters', () => ({ listShelters: vi.fn(), createShelter: vi.fn(), updateShelter: vi.fn(), deleteShelter: vi.fn(), getAttachments: vi.fn() }));
vi.mock('../../src/api/runs', () => ({ startRun: vi.fn(), listRuns: vi.fn(), getRun: vi.fn(), cancelRun: vi.fn(), runExportUrl: vi.fn() }));
vi.mock('../../src/api/sweeps', () => ({ getSweep: vi.fn(), listSweeps: vi.fn(), startSweep: vi.fn() }));
const importsApi = await import('../../src/api/imports');
const zonesApi = await import('../../src/api/zones');
const sheltersApi = await import('../../src/api/shelters');
const { useZonesSheltersStore } = await import('../../src/stores/zones-shelters');

const planId = '00000000-0000-4000-8000-00000000000a';
const file = new File(['{}'], 'zones.geojson');
const zone = (id: number) => ({ id, name: `Zone ${id}` }) as never;

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
  vi.mocked(sheltersApi.getAttachments).mockResolvedValue({ zones: [], shelters: [] } as never);
  vi.mocked(zonesApi.listZones).mockResolvedValue([]);
  vi.mocked(sheltersApi.listShelters).mockResolvedValue([]);
});

describe('zone and shelter uploads', () => {
  it('imports zones as a job, reports the server phase, and reads the list again', async () => {
    const store = useZonesSheltersStore();
    await store.load(planId);
    vi.mocked(importsApi.importFile).mockImplementation(async (_plan, _kind, _file, options) => {
      options?.onServerProgress?.('reading the file', 0.5);
      return { status: 'succeeded', outcome: { created: 2 } } as never;
    });
    vi.mocked(zonesApi.listZones).mockResolvedValue([zone(1), zone(2)]);
    const phases: string[] = [];
    const count = await store.uploadZones(file, (phase, share) => phases.push(`${phase} ${share}`));
    expect(count).toBe(2);
    expect(vi.mocked(importsApi.importFile).mock.calls[0]!.slice(0, 3)).toEqual([planId, 'zones', file]);
    expect(phases).toEqual(['reading the file 0.5']);
    expect(store.zones.map((z) => z.id)).toEqual([1, 2]);
  });

  it('imports shelters as their own kind, and a refused file changes no list', async () => {
    const store = useZonesSheltersStore();
    await store.load(planId);
    vi.mocked(importsApi.importFile).mockRejectedValue(new ApiError(400, 'invalid_request', 'shelters.geojson: feature 3 has no capacity'));
    await expect(store.uploadShelters(file)).rejects.toThrow('feature 3 has no capacity');
    expect(vi.mocked(importsApi.importFile).mock.calls.at(-1)![1]).toBe('shelters');
    expect(sheltersApi.listShelters).toHaveBeenCalledTimes(1);
  });
});
