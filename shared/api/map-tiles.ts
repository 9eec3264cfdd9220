// Map tiles: the road layer and a run's per-road figures as Mapbox Vector Tiles (MVT 2.1, the
// open format PostGIS writes with ST_AsMVT), one layer named `roads`, addressed z/x/y in the
// usual web-map (XYZ) scheme. The properties below are the contract between the server's tile
// query and the client's styling.
import { z } from 'zod';
import type { RoadClass } from './road-attributes';

export const roadTileLayer = 'roads';
/** Tile coordinates span 0..extent-1 (the MVT default). */
export const tileExtent = 4096;
export const tileMaxZoom = 22;

/** Properties of every road feature; lanes are absent where the data had none. */
export type RoadTileProperties = {
  id: number;
  roadClass: RoadClass;
  lanesForward?: number;
  lanesBackward?: number;
  oneway: boolean;
  closed: boolean;
  name?: string;
};

/** A run's tile adds its figures: utilisation of the busier direction, whether the road is in
 *  the steady-state cut either way, and its share of the time-expanded cut. */
export type RunTileProperties = RoadTileProperties & { utilisation: number; inCut: boolean; shareOfCut: number };

// Lowest tile zoom at which a class is drawn: below it the class is thinner than a pixel and
// would only fill the tile (common practice in web cartography: minor streets appear from about
// zoom 12-13). A run's tiles also show, from `loadedRoadsMinZoom`, every road that carries flow.
export const roadClassMinZoom: Record<RoadClass, number> = {
  motorway: 0,
  motorway_link: 9,
  trunk: 0,
  trunk_link: 9,
  primary: 0,
  primary_link: 10,
  secondary: 7,
  secondary_link: 11,
  tertiary: 9,
  tertiary_link: 11,
  unclassified: 12,
  residential: 12,
  living_street: 13,
  service: 13,
};
// Measured on a 180,600-segment grid county: from zoom 11 with every street, or from 9 with
// every loaded road, a tile held up to 1.7 and 4.9 MB; from 12 the largest is about 0.5 MB.
export const loadedRoadsMinZoom = 12;

export const tileParamsSchema = z
  .object({
    planId: z.string().uuid('Not a valid identifier.'),
    z: z.coerce.number().int().min(0).max(tileMaxZoom),
    x: z.coerce.number().int().min(0),
    y: z.coerce.number().int().min(0),
  })
  .refine((t) => t.x < 2 ** t.z && t.y < 2 ** t.z, { message: 'No such tile at this zoom.', path: ['x'] });
export type TileAddress = z.infer<typeof tileParamsSchema>;

export const runTileParamsSchema = z
  .object({
    planId: z.string().uuid('Not a valid identifier.'),
    runId: z.string().uuid('Not a valid identifier.'),
    z: z.coerce.number().int().min(0).max(tileMaxZoom),
    x: z.coerce.number().int().min(0),
    y: z.coerce.number().int().min(0),
  })
  .refine((t) => t.x < 2 ** t.z && t.y < 2 ** t.z, { message: 'No such tile at this zoom.', path: ['x'] });

// A few roads' geometry by id (the segment table zooms to a row; a scenario draws its changes).
export const maxGeometryIds = 500;
export const segmentGeometryQuerySchema = z.object({
  ids: z
    .string()
    .transform((s) => s.split(',').filter((p) => p !== '').map(Number))
    .pipe(z.array(z.number().int().positive()).min(1).max(maxGeometryIds, `At most ${maxGeometryIds} roads at once.`)),
});
