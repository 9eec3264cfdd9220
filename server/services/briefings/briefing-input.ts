// Everything a briefing prints, gathered by the caller (the briefing service) from the database.
// The document builder reads nothing else: no clock, no database, no files.
import type { UnitSystem } from '../../../shared/api/units';
import type { Run, RunResult } from '../../../shared/api/runs';
import type { ProposalResult } from '../../../shared/api/proposals';

export type BriefingStatus = 'draft' | 'awaiting-sign-off' | 'signed' | 'returned';

/** [longitude, latitude] in degrees (WGS84), as GeoJSON orders them. */
export type LonLat = [number, number];

export type MapSegment = {
  id: number;
  /** The segment's vertices in stored order; "forward" runs from the first to the last. */
  coordinates: LonLat[];
  /** OpenStreetMap `highway=*` class. */
  roadClass: string;
};

export type MapZone = {
  id: number;
  name: string;
  /** Polygon rings (outer rings and holes alike); drawn with the even-odd rule. */
  rings: LonLat[][];
};

export type MapShelter = { id: number; name: string; location: LonLat };

export type BriefingMapInput = {
  /** The roads drawn: at county scale only the classes the page can show, each class merged into
   *  lines (negative ids), plus every choke point and fix as its own segment (map-roads.ts). */
  segments: MapSegment[];
  zones: MapZone[];
  shelters: MapShelter[];
  /** Road classes left out at the map's scale (absent in older briefings: everything was drawn). */
  leftOut?: { roadClass: string; segments: number }[] | undefined;
};

/** One row of the plan's capacity table as the run used it, each value with its source. */
export type CapacityAssumption = {
  roadClass: string;
  lanesPerDirection: number;
  lanesSource: string;
  speedKmh: number;
  speedSource: string;
  capacityVehPerHourPerLane: number;
  capacitySource: string;
  jamDensityVehPerKmPerLane?: number | undefined;
  jamDensitySource?: string | undefined;
};

export type BriefingAssumptions = {
  /** What the data version is, in words (e.g. "road layer of 20 November 2026, 412 segments"). */
  dataDescription: string;
  capacityTable: CapacityAssumption[];
  /** Why the run's capacity factor (e.g. "heavy rain, HCM 7th ed. Exhibit 11-20"); '' if none. */
  capacityFactorNote: string;
  /** Persons per vehicle used to turn vehicles into persons (the vehicle-weighted mean). */
  personsPerVehicle: number;
  personsPerVehicleSource: string;
  /** Share of residents who leave, per zone, with the default's source (absent in older briefings). */
  participation?: string | undefined;
  /** The departure (mobilisation) curve in words, with its parameters and source. */
  departureCurve: string;
};

export type BriefingPerson = { name: string; role: string };

export type BriefingSignature = BriefingPerson & { signedAt: Date };

export type BriefingReturn = BriefingPerson & { returnedAt: Date; comment: string };

export type BriefingInput = {
  briefingId: string;
  /** 1 for the first briefing of a run; a new version is a new briefing. */
  version: number;
  organizationName: string;
  planName: string;
  /** null: the plan's own data, no scenario. */
  scenarioName: string | null;
  createdAt: Date;
  preparedBy: BriefingPerson;
  status: BriefingStatus;
  run: Run;
  result: RunResult;
  assumptions: BriefingAssumptions;
  map: BriefingMapInput;
  /** Present exactly when status is 'signed'. */
  signature?: BriefingSignature | undefined;
  /** Present when status is 'returned'. */
  returned?: BriefingReturn | undefined;
  /** Printed under the sign-off so a reader knows where to check a copy. */
  verificationUrl?: string | undefined;
  /** IANA time zone for dates on the page; the organisation's. */
  timeZone: string;
  /** The organisation's units for speeds, densities and the map's scale (metric when absent);
   *  like the time zone, how the page reads, not what the figures say: outside the content hash. */
  unitSystem?: UnitSystem | undefined;
  pageSize?: 'LETTER' | 'A4' | undefined;
  /** Searches for the best change run on exactly this run's problem (one per kind), printed on a page of their own. */
  searches?: ProposalResult[] | undefined;
};
