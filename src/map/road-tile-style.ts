// How a road drawn from a map tile looks: the same looks as everywhere (road-style.ts before a
// run, utilisation-scale.ts after one), read from the tile's properties (shared/api/map-tiles).
// Pure: no Leaflet and no tile layer here.
import type { RoadClass } from '@shared/api/road-attributes';
import { drivableRoadClasses } from '@shared/api/road-attributes';
import { roadStyle, roadWeight, type LineStyle } from './road-style';
import { utilisationStyle } from './utilisation-scale';

type TileProps = Record<string, unknown>;

const classes = new Set<string>(drivableRoadClasses);

/** The road's attributes as road-style.ts takes them; an unknown class draws as a minor road. */
export function roadOfTile(props: TileProps) {
  const roadClass = (typeof props.roadClass === 'string' && classes.has(props.roadClass) ? props.roadClass : 'unclassified') as RoadClass;
  const lanes = (v: unknown) => (typeof v === 'number' ? v : null);
  return { roadClass, lanesForward: lanes(props.lanesForward), lanesBackward: lanes(props.lanesBackward), closed: props.closed === true };
}

/** A road's look at a zoom level; `withResult` when the tile carries a run's figures. */
export function roadTileStyle(props: TileProps, zoom: number, withResult: boolean): LineStyle {
  const road = roadOfTile(props);
  if (!withResult || road.closed) return roadStyle(road, zoom);
  const utilisation = typeof props.utilisation === 'number' ? props.utilisation : 0;
  return utilisationStyle(utilisation, roadWeight(road, zoom));
}
