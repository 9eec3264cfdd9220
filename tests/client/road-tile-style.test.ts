// Roads drawn from map tiles look as roads drawn anywhere else: the tile's properties give the
// same style as the road's attributes do (road-style.ts, utilisation-scale.ts).
import { describe, expect, it } from 'vitest';
import { roadOfTile, roadTileStyle } from '../../src/map/road-tile-style';
import { roadStyle, roadWeight } from '../../src/map/road-style';
import { utilisationStyle } from '../../src/map/utilisation-scale';

describe('a road from a tile', () => {
  it('reads class, lanes and closure from the properties; absent lanes are no data', () => {
    expect(roadOfTile({ id: 4, roadClass: 'primary', lanesForward: 3, closed: false })).toEqual({ roadClass: 'primary', lanesForward: 3, lanesBackward: null, closed: false });
    expect(roadOfTile({ id: 4, roadClass: 'not-a-class', closed: true }).roadClass).toBe('unclassified');
  });

  it('is styled by class before a run and by utilisation with one', () => {
    const props = { id: 1, roadClass: 'secondary', lanesForward: 2, lanesBackward: 1, closed: false, utilisation: 0.8 };
    const road = roadOfTile(props);
    expect(roadTileStyle(props, 14, false)).toEqual(roadStyle(road, 14));
    expect(roadTileStyle(props, 14, true)).toEqual(utilisationStyle(0.8, roadWeight(road, 14)));
    expect(roadTileStyle(props, 14, true).color).not.toBe(roadTileStyle(props, 14, false).color);
  });

  it('stays drawn as closed over a run’s colours', () => {
    const props = { id: 1, roadClass: 'secondary', closed: true, utilisation: 0 };
    expect(roadTileStyle(props, 12, true)).toEqual(roadStyle(roadOfTile(props), 12));
    expect(roadTileStyle(props, 12, true).dashArray).toBeDefined();
  });
});
