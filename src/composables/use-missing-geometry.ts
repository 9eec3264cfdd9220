// Choke points on roads the map has not loaded (far outside the view, or left out of a truncated
// answer) take their geometry from the run's arcs export, once per run, so that they can still
// be drawn and zoomed to.
import { watch, type Ref } from 'vue';
import type { Bottleneck, Run } from '@shared/api/runs';
import { getRunSegmentGeometry } from '@/api/runs';

type Coordinates = [number, number][];

export type MissingGeometryOptions = {
  /** The run whose result is shown, or null. */
  run: Ref<Run | null>;
  bottlenecks: Ref<readonly Bottleneck[]>;
  /** True once the road layer has loaded and is not loading: before that it may still bring it. */
  settled: Ref<boolean>;
  geometryVersion: Ref<number>;
  geometryOf: (segmentId: number) => Coordinates | undefined;
  remember: (more: Map<number, Coordinates>) => void;
};

export function useMissingGeometry(options: MissingGeometryOptions) {
  let askedFor = '';
  watch([options.run, options.bottlenecks, options.geometryVersion, options.settled], async () => {
    const run = options.run.value;
    if (!run || !options.settled.value || askedFor === run.id) return;
    if (options.bottlenecks.value.every((b) => options.geometryOf(b.segmentId))) return;
    askedFor = run.id;
    try {
      options.remember(await getRunSegmentGeometry(run.planId, run.id));
    } catch {
      // The table still lists them; only drawing and zooming to those roads is unavailable.
    }
  });
}
