// One road's figures in the shown run, asked for by road when the road or the run changes (a
// result does not carry every road's: server/routes/map-tiles.ts).
import { ref, watch, type Ref } from 'vue';
import type { Run } from '@shared/api/runs';
import { getRoadResult } from '@/api/map-tiles';
import { segmentLoad, type SegmentLoad } from '@/format/run-result';

export function useRunRoadLoad(segmentId: Ref<number>, run: Ref<Run | null>): Ref<SegmentLoad | null> {
  const load = ref<SegmentLoad | null>(null);
  let asked = 0;
  watch(
    [segmentId, run],
    async ([id, r]) => {
      const ticket = ++asked;
      load.value = null;
      if (!r) return;
      try {
        const road = await getRoadResult(r.planId, r.id, id);
        if (ticket === asked) load.value = road ? segmentLoad(road) : null;
      } catch {
        // The attributes stay editable; only the figures are missing.
      }
    },
    { immediate: true },
  );
  return load;
}
