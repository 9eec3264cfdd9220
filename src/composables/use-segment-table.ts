// Server-side paging, sorting and filtering for the segment table: one request per change of
// options, older requests aborted, filters typed into the name field debounced.
import { onBeforeUnmount, ref, watch, type Ref } from 'vue';
import type { RoadClass } from '@shared/api/road-attributes';
import { segmentSortKeys, type Segment, type SegmentPageQuery } from '@shared/api/road-layers';
import { listSegments } from '@/api/road-layers';
import { messageOf } from '@/format/error-message';

export type SegmentTableOptions = { page: number; itemsPerPage: number; sortBy: { key: string; order?: 'asc' | 'desc' | boolean }[] };
export type SegmentFilters = { name: string; roadClass: RoadClass | null; closed: 'true' | 'false' | null; bridge: 'true' | 'false' | null };

type SortKey = (typeof segmentSortKeys)[number];
const isSortKey = (key: string): key is SortKey => (segmentSortKeys as readonly string[]).includes(key);

/** The table's options and filters as the API's query (page size capped at the server's 500). */
export function segmentQuery(options: SegmentTableOptions, filters: SegmentFilters): SegmentPageQuery {
  const sort = options.sortBy[0];
  const query: SegmentPageQuery = {
    page: Math.max(1, options.page),
    // Vuetify says -1 for "all": the server sends at most 500 at a time.
    pageSize: options.itemsPerPage <= 0 ? 500 : Math.min(500, options.itemsPerPage),
  };
  if (sort && isSortKey(sort.key)) {
    query.sortBy = sort.key;
    query.sortOrder = sort.order === 'desc' ? 'desc' : 'asc';
  }
  const name = filters.name.trim();
  if (name) query.name = name.slice(0, 200);
  if (filters.roadClass) query.roadClass = filters.roadClass;
  if (filters.closed) query.closed = filters.closed;
  if (filters.bridge) query.bridge = filters.bridge;
  return query;
}

export function useSegmentTable(planId: Ref<string>, version: Ref<number>) {
  const items = ref<Segment[]>([]);
  const total = ref(0);
  const loading = ref(false);
  const error = ref('');
  const options = ref<SegmentTableOptions>({ page: 1, itemsPerPage: 25, sortBy: [] });
  const filters = ref<SegmentFilters>({ name: '', roadClass: null, closed: null, bridge: null });
  let controller: AbortController | null = null;
  let nameTimer: ReturnType<typeof setTimeout> | null = null;

  async function load() {
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    loading.value = true;
    try {
      const page = await listSegments(planId.value, segmentQuery(options.value, filters.value), mine.signal);
      if (mine.signal.aborted) return;
      items.value = page.items;
      total.value = page.total;
      error.value = '';
    } catch (e) {
      if (!mine.signal.aborted) error.value = messageOf(e);
    } finally {
      if (controller === mine) loading.value = false;
    }
  }

  function setOptions(next: SegmentTableOptions) {
    options.value = next;
    void load();
  }

  watch(
    () => [filters.value.roadClass, filters.value.closed, filters.value.bridge],
    () => {
      options.value = { ...options.value, page: 1 };
      void load();
    },
  );
  watch(
    () => filters.value.name,
    () => {
      if (nameTimer) clearTimeout(nameTimer);
      nameTimer = setTimeout(() => {
        options.value = { ...options.value, page: 1 };
        void load();
      }, 300);
    },
  );
  watch(version, () => void load());

  onBeforeUnmount(() => {
    controller?.abort();
    if (nameTimer) clearTimeout(nameTimer);
  });

  return { items, total, loading, error, options, filters, setOptions, load };
}
