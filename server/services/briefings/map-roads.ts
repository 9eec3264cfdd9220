// Which roads the briefing map draws, so that it stays legible from a town to a county. A printed
// map of a county cannot show every street: at 30 km on a 300 pt figure, 100 m blocks are 1 pt
// apart and the local streets fill the page grey. So classes are drawn from the most important
// down while the drawn roads stay apart on the page, and the rest are left out (and said so in
// the legend). Above a few thousand drawn segments the roads of one class are merged into lines
// and simplified to what the page can show, which keeps the figure, and the PDF, small.
// Choke points and fixes are drawn whatever their class (the caller keeps them).
import { roadStyle } from './map-svg';

export type ClassLength = { roadClass: string; segments: number; lengthMeters: number };

/** The map's drawing box on the page, pt (the briefing's map figure less its padding and legend). */
export const BRIEFING_MAP_BOX = { width: 516 - 28, height: 350 - 46 - 28 };

/**
 * Mean distance between drawn roads on the page below which a further class is left out, pt.
 * Roads of a grid with spacing d fill an area A with 2·A/d of line, so d = 2·A / drawn length.
 * Six points keeps thin lines (1–2.5 pt wide) well apart with white between them, so the zones,
 * labels and choke points stay readable over the mesh (common practice in small-scale
 * cartography: thin out rather than print a solid tone; 3 pt still printed the county's
 * collector grid as a dense mesh).
 */
export const MIN_ROAD_SPACING_PT = 6;

/** Drawn segments above which each class is merged into lines and simplified. */
export const MERGE_ABOVE_SEGMENTS = 5000;

/** Simplification tolerance on the page, pt: what a printed line cannot show anyway. */
export const SIMPLIFY_PT = 0.5;

export type MapRoadPlan = {
  drawn: string[];
  leftOut: { roadClass: string; segments: number }[];
  /** Merge and simplify each drawn class instead of drawing its segments one by one. */
  merge: boolean;
  /** Page pt per metre at the map's scale. */
  scale: number;
  /** Simplification tolerance on the ground, metres (when merging). */
  toleranceMeters: number;
};

/** Classes most important first (as the map draws them on top), then by name for a stable order. */
function byImportance(a: ClassLength, b: ClassLength): number {
  return roadStyle(b.roadClass).order - roadStyle(a.roadClass).order || a.roadClass.localeCompare(b.roadClass);
}

/**
 * The classes to draw for a layer of the given class lengths over an extent of
 * `widthMeters` × `heightMeters`, fitted into `box` (pt) at one scale. The most important class
 * is always drawn; each next one only while the mean spacing stays at least MIN_ROAD_SPACING_PT.
 * Classes of equal importance (the same map style) are taken or left together.
 */
export function planMapRoads(classes: readonly ClassLength[], extent: { widthMeters: number; heightMeters: number }, box = BRIEFING_MAP_BOX): MapRoadPlan {
  const w = Math.max(extent.widthMeters, 500);
  const h = Math.max(extent.heightMeters, 500);
  const scale = Math.min(box.width / w, box.height / h);
  const area = w * scale * (h * scale);
  const ordered = [...classes].sort(byImportance);
  const drawn: ClassLength[] = [];
  let length = 0;
  for (let i = 0; i < ordered.length; ) {
    const order = roadStyle(ordered[i]!.roadClass).order;
    const group: ClassLength[] = [];
    while (i < ordered.length && roadStyle(ordered[i]!.roadClass).order === order) group.push(ordered[i++]!);
    const withGroup = length + group.reduce((s, c) => s + c.lengthMeters, 0) * scale;
    if (drawn.length > 0 && (2 * area) / withGroup < MIN_ROAD_SPACING_PT) {
      const leftOut = ordered.filter((c) => !drawn.includes(c)).map((c) => ({ roadClass: c.roadClass, segments: c.segments }));
      return finish(drawn, leftOut, scale);
    }
    drawn.push(...group);
    length = withGroup;
  }
  return finish(drawn, [], scale);
}

function finish(drawn: ClassLength[], leftOut: MapRoadPlan['leftOut'], scale: number): MapRoadPlan {
  const segments = drawn.reduce((s, c) => s + c.segments, 0);
  return { drawn: drawn.map((c) => c.roadClass), leftOut, merge: segments > MERGE_ABOVE_SEGMENTS, scale, toleranceMeters: SIMPLIFY_PT / scale };
}
