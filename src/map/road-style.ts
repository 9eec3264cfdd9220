// How a road looks before any analysis: a cool ramp from dark (motorways) to lighter (service
// roads) so that the warm utilisation colours of a result stand apart, and a width that grows
// with the lanes. Even the lightest class keeps 3:1 against a light basemap (WCAG 2.1 SC 1.4.11,
// non-text contrast), so narrow streets stay visible. Closed roads are dashed red. Pure: no Leaflet here, only path options.
import type { RoadClass } from '@shared/api/road-attributes';

export type LineStyle = { color: string; weight: number; opacity: number; dashArray?: string; lineCap?: 'round' | 'butt' };

type ClassLook = { label: string; color: string; baseWeight: number; defaultLanes: number };

/** Grouped for the legend; `_link` classes share their parent's look. */
export const roadClassLooks: Record<RoadClass, ClassLook> = {
  motorway: { label: 'Motorway', color: '#1b2f45', baseWeight: 3.2, defaultLanes: 2 },
  motorway_link: { label: 'Motorway ramp', color: '#1b2f45', baseWeight: 2, defaultLanes: 1 },
  trunk: { label: 'Trunk road', color: '#27506e', baseWeight: 3, defaultLanes: 2 },
  trunk_link: { label: 'Trunk ramp', color: '#27506e', baseWeight: 1.8, defaultLanes: 1 },
  primary: { label: 'Primary road', color: '#2f6f96', baseWeight: 2.6, defaultLanes: 2 },
  primary_link: { label: 'Primary link', color: '#2f6f96', baseWeight: 1.6, defaultLanes: 1 },
  secondary: { label: 'Secondary road', color: '#3f7fa6', baseWeight: 2.2, defaultLanes: 1 },
  secondary_link: { label: 'Secondary link', color: '#3f7fa6', baseWeight: 1.5, defaultLanes: 1 },
  tertiary: { label: 'Tertiary road', color: '#5b86a3', baseWeight: 1.9, defaultLanes: 1 },
  tertiary_link: { label: 'Tertiary link', color: '#5b86a3', baseWeight: 1.4, defaultLanes: 1 },
  unclassified: { label: 'Minor road', color: '#66798a', baseWeight: 1.4, defaultLanes: 1 },
  residential: { label: 'Residential street', color: '#66798a', baseWeight: 1.4, defaultLanes: 1 },
  living_street: { label: 'Living street', color: '#7b8791', baseWeight: 1, defaultLanes: 1 },
  service: { label: 'Service road', color: '#7b8791', baseWeight: 1, defaultLanes: 1 },
};

export const closedRoadColor = '#b3261e';
/** Extra width per lane beyond the first in the busier direction, pixels. */
const weightPerExtraLane = 0.9;
const maxWeight = 9;

export type RoadStyleInput = {
  roadClass: RoadClass;
  lanesForward: number | null;
  lanesBackward: number | null;
  closed: boolean;
};

/** Lanes in the busier direction; null (no data) falls back to the class's usual count. */
export function lanesShown(road: Pick<RoadStyleInput, 'roadClass' | 'lanesForward' | 'lanesBackward'>): number {
  const fallback = roadClassLooks[road.roadClass].defaultLanes;
  return Math.max(road.lanesForward ?? fallback, road.lanesBackward ?? 0, 1);
}

/** Line width for a road at a zoom level: thinner when zoomed far out, so a town stays legible. */
export function roadWeight(road: Pick<RoadStyleInput, 'roadClass' | 'lanesForward' | 'lanesBackward'>, zoom: number): number {
  const look = roadClassLooks[road.roadClass];
  const width = look.baseWeight + weightPerExtraLane * (lanesShown(road) - 1);
  const zoomScale = zoom >= 15 ? 1.25 : zoom >= 13 ? 1 : zoom >= 11 ? 0.75 : 0.55;
  return Math.min(maxWeight, Math.round(width * zoomScale * 10) / 10);
}

export function roadStyle(road: RoadStyleInput, zoom: number): LineStyle {
  const weight = roadWeight(road, zoom);
  if (road.closed) return { color: closedRoadColor, weight: Math.max(weight, 1.5), opacity: 0.9, dashArray: '4 4', lineCap: 'butt' };
  return { color: roadClassLooks[road.roadClass].color, weight, opacity: 0.9, lineCap: 'round' };
}

/** One legend row per distinct look (links are folded into their parent class). */
export function roadLegend(): { label: string; color: string; weight: number; dashed?: boolean }[] {
  const rows: { label: string; color: string; weight: number; dashed?: boolean }[] = [];
  for (const [roadClass, look] of Object.entries(roadClassLooks) as [RoadClass, ClassLook][]) {
    if (roadClass.endsWith('_link') || roadClass === 'unclassified' || roadClass === 'living_street') continue;
    rows.push({ label: look.label, color: look.color, weight: look.baseWeight });
  }
  rows.push({ label: 'Closed', color: closedRoadColor, weight: 2, dashed: true });
  return rows;
}
