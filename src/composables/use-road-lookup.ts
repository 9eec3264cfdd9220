// Reading roads of a plan's active layer outside the workspace (the scenario editor's search and
// picked road, the comparison map's layer): a search by name or bridge, one road, the layer.
import type { SegmentPageQuery } from '@shared/api/road-layers';
import { getRoadLayer, getSegment, listSegments } from '@/api/road-layers';

export function useRoadLookup(planId: () => string) {
  return {
    search: (query: SegmentPageQuery, signal?: AbortSignal) => listSegments(planId(), query, signal),
    road: (segmentId: number) => getSegment(planId(), segmentId),
    layer: () => getRoadLayer(planId()),
  };
}
