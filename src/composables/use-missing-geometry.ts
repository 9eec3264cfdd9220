// The choke points of the shown run are drawn wherever they are, on screen or not: their
// geometry (with the fixes', a short list) comes in one small answer per run, since the road
// tiles on screen hold only the roads in view.
import { watch, type Ref } from 'vue';
import type { ChokePoint, Run } from '@shared/api/runs';
import { getChokePointGeometry } from '@/api/map-tiles';

type Coordinates = [number, number][];

export type MissingGeometryOptions = {
  /** The run whose result is shown, or null. */
  run: Ref<Run | null>;
  chokePoints: Ref<readonly ChokePoint[]>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  remember: (more: Map<number, Coordinates>) => void;
};

export function useMissingGeometry(options: MissingGeometryOptions) {
  let askedFor = '';
  watch(
    [options.run, options.chokePoints],
    async () => {
      const run = options.run.value;
      if (!run || askedFor === run.id) return;
      if (options.chokePoints.value.every((b) => options.geometryOf(b.segmentId))) return;
      askedFor = run.id;
      try {
        options.remember(await getChokePointGeometry(run.planId, run.id));
      } catch {
        // The table still lists them; only drawing and zooming to those roads is unavailable.
      }
    },
    { immediate: true },
  );
}

/** The same for several runs (the comparison): each run's list asked for once, until every
 *  road named is known. */
export function useRunsChokePointGeometry(options: {
  runs: Ref<readonly Run[]>;
  segmentIds: Ref<readonly number[]>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  remember: (more: Map<number, Coordinates>) => void;
}) {
  const asked = new Set<string>();
  watch(
    [options.runs, options.segmentIds],
    async () => {
      for (const run of options.runs.value) {
        if (options.segmentIds.value.every((id) => options.geometryOf(id))) return;
        if (asked.has(run.id)) continue;
        asked.add(run.id);
        try {
          options.remember(await getChokePointGeometry(run.planId, run.id));
        } catch {
          // The table still lists them; only drawing those roads is unavailable.
        }
      }
    },
    { immediate: true },
  );
}
