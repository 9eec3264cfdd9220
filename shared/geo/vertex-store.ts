// Vertices of the road lines, shared by identical position, with a local metric plane for
// topology decisions (crossings, snapping) and a union–find for vertices joined later.
import type { LonLat } from '../api/road-attributes';

/** Earth's mean radius as turf uses it (metres), so plane distances agree with turf's. */
const EARTH_RADIUS_METERS = 6371008.8;

/** Positions closer than this (1e-7 degree, about 1 cm) are one vertex. */
const KEY_SCALE = 1e7;

/**
 * An equirectangular plane around the data's mean latitude. It is affine in lon/lat, so
 * straight edges stay straight and an intersection found in the plane lies on both edges in
 * lon/lat too. Its distance error grows with the distance from the mean latitude (about
 * 1 % per 0.6° at 45°), which only shifts snapping tolerances; reported lengths come from
 * turf's haversine instead.
 */
export class LocalPlane {
  readonly metersPerDegreeLon: number;
  readonly metersPerDegreeLat: number;

  constructor(
    readonly lon0: number,
    readonly lat0: number,
  ) {
    this.metersPerDegreeLat = (Math.PI / 180) * EARTH_RADIUS_METERS;
    this.metersPerDegreeLon = this.metersPerDegreeLat * Math.cos((lat0 * Math.PI) / 180);
  }

  x(lon: number): number {
    return (lon - this.lon0) * this.metersPerDegreeLon;
  }

  y(lat: number): number {
    return (lat - this.lat0) * this.metersPerDegreeLat;
  }

  lonLat(x: number, y: number): LonLat {
    return [this.lon0 + x / this.metersPerDegreeLon, this.lat0 + y / this.metersPerDegreeLat];
  }

  static around(lines: readonly (readonly LonLat[])[]): LocalPlane {
    let sumLon = 0;
    let sumLat = 0;
    let n = 0;
    for (const line of lines) for (const [lon, lat] of line) {
      sumLon += lon;
      sumLat += lat;
      n += 1;
    }
    return n === 0 ? new LocalPlane(0, 0) : new LocalPlane(sumLon / n, sumLat / n);
  }
}

export class VertexStore {
  readonly lon: number[] = [];
  readonly lat: number[] = [];
  readonly x: number[] = [];
  readonly y: number[] = [];
  private readonly parent: number[] = [];
  private readonly byKey = new Map<string, number>();

  constructor(readonly plane: LocalPlane) {}

  get size(): number {
    return this.lon.length;
  }

  /** The vertex at this position, created if new. */
  intern(lon: number, lat: number): number {
    const key = `${Math.round(lon * KEY_SCALE)}:${Math.round(lat * KEY_SCALE)}`;
    const found = this.byKey.get(key);
    if (found !== undefined) return found;
    const id = this.lon.length;
    this.lon.push(lon);
    this.lat.push(lat);
    this.x.push(this.plane.x(lon));
    this.y.push(this.plane.y(lat));
    this.parent.push(id);
    this.byKey.set(key, id);
    return id;
  }

  /** The representative of v's group (path halving). */
  find(v: number): number {
    const parent = this.parent;
    let p = parent[v]!;
    while (p !== v) {
      const gp = parent[p]!;
      parent[v] = gp;
      v = p;
      p = gp;
    }
    return v;
  }

  /** Joins `moved` into `target`'s group; the group keeps target's position. */
  join(moved: number, target: number): void {
    const a = this.find(moved);
    const b = this.find(target);
    if (a !== b) this.parent[a] = b;
  }

  position(v: number): LonLat {
    return [this.lon[v]!, this.lat[v]!];
  }
}
