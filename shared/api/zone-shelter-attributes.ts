// Zones (sources) and shelters (sinks): their attributes and how they attach to the roads.
// Units are in every field name.
import { z } from 'zod';

// ---------------------------------------------------------------------------------------------
// Zones (sources) and shelters (sinks)

/**
 * When residents leave, as the cumulative share departed by time t (hours after the order):
 * - `allAtOnce`: F(t) = 1 for t ≥ 0.
 * - `uniform`: F(t) = min(1, t / durationHours).
 * - `logistic` (S-curve): P(t) = 1 / (1 + e^(−α(t − H))), α = responseRatePerHour,
 *   H = halfLoadingHours; shifted so that nobody has left at t = 0:
 *   F(t) = (P(t) − P(0)) / (1 − P(0)).
 * - `rayleigh`: F(t) = 1 − exp(−t² / (2σ²)), σ = sigmaHours.
 * The two S-shaped forms fit observed evacuations (Li, Ozbay, Bartin et al. 2013, TRR 2376).
 */
export const departureCurveSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('allAtOnce') }),
  z.object({ kind: z.literal('uniform'), durationHours: z.number().positive().max(72) }),
  z.object({
    kind: z.literal('logistic'),
    responseRatePerHour: z.number().positive().max(100),
    halfLoadingHours: z.number().min(0).max(72),
  }),
  z.object({ kind: z.literal('rayleigh'), sigmaHours: z.number().positive().max(72) }),
]);
export type DepartureCurve = z.infer<typeof departureCurveSchema>;

export const zoneAttributesSchema = z.object({
  name: z.string().min(1).max(200),
  /** Resident population, persons. */
  population: z.int().min(0).max(50_000_000),
  /** Share of residents who leave, 0–1. */
  participationRate: z.number().min(0).max(1),
  /** Persons per evacuating vehicle. */
  personsPerVehicle: z.number().min(1).max(10),
  departureCurve: departureCurveSchema,
});
export type ZoneAttributes = z.infer<typeof zoneAttributesSchema>;

export const shelterAttributesSchema = z.object({
  name: z.string().min(1).max(200),
  /** Persons the shelter can take; null = an unbounded exit (e.g. at the study-area edge). */
  capacityPersons: z.int().min(0).max(50_000_000).nullable(),
});
export type ShelterAttributes = z.infer<typeof shelterAttributesSchema>;

/** Which network nodes a zone feeds; `inside` = nodes in its polygon, else the nearest one. */
export const zoneAttachmentSchema = z.object({
  zoneIndex: z.int().min(0),
  entryNodes: z.array(z.int().min(0)).min(1),
  attachedBy: z.enum(['inside', 'nearest']),
  /** Distance from the polygon to the node when attached by `nearest`, metres; 0 when inside. */
  distanceMeters: z.number().min(0),
});
export type ZoneAttachment = z.infer<typeof zoneAttachmentSchema>;

export const shelterAttachmentSchema = z.object({
  shelterIndex: z.int().min(0),
  node: z.int().min(0),
  distanceMeters: z.number().min(0),
});
export type ShelterAttachment = z.infer<typeof shelterAttachmentSchema>;
