// The segment table's options as the API's query, checked against the server's own schema.
import { describe, expect, it } from 'vitest';
import { segmentPageQuerySchema } from '../../shared/api/road-layers';
import { segmentPageSearch } from '../../src/api/road-layers';
import { segmentQuery } from '../../src/composables/use-segment-table';

const none = { name: '', roadClass: null, closed: null, bridge: null };

describe('segment table query', () => {
  it('maps page, size, sort and filters to what the server accepts', () => {
    const query = segmentQuery({ page: 3, itemsPerPage: 50, sortBy: [{ key: 'lengthMeters', order: 'desc' }] }, { name: ' Quay ', roadClass: 'primary', closed: 'true', bridge: null });
    expect(query).toEqual({ page: 3, pageSize: 50, sortBy: 'lengthMeters', sortOrder: 'desc', name: 'Quay', roadClass: 'primary', closed: 'true' });
    const parsed = segmentPageQuerySchema.parse(Object.fromEntries(new URLSearchParams(segmentPageSearch(query))));
    expect(parsed).toMatchObject({ page: 3, pageSize: 50, sortBy: 'lengthMeters', sortOrder: 'desc', roadClass: 'primary', closed: true });
  });

  it('caps the page size at 500 and ignores sorting by columns the server cannot sort', () => {
    const query = segmentQuery({ page: 0, itemsPerPage: 10_000, sortBy: [{ key: 'bridge', order: 'asc' }] }, none);
    expect(query).toEqual({ page: 1, pageSize: 500 });
    expect(segmentQuery({ page: 1, itemsPerPage: -1, sortBy: [] }, none).pageSize).toBe(500);
    expect(segmentPageQuerySchema.safeParse(query).success).toBe(true);
  });
});
