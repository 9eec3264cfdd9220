// The sources the defaults cite are published documents (handbooks, manuals, papers, the
// OpenStreetMap wiki) or say "common practice" / "from memory": none names a program. Every
// capitalised word in a source text must belong to one of the references below, so a new
// source that names a software package, a model or a vendor fails here until it is replaced.
import { describe, expect, it } from 'vitest';
import { DEFAULT_CAPACITY_ROWS, modelSourceTexts } from '../../../shared/model';

const ALLOWED_CAPITALISED = new Set([
  // Highway Capacity Manual (TRB) and its notation: HCM, Exhibit, Eq., FFS (free-flow speed), N (appendix N).
  'HCM', 'Exhibit', 'Eq', 'FFS', 'N',
  // FHWA Highway Performance Monitoring System Field Manual (2002), App. N; FHWA-HOP-13-042 (2013).
  'FHWA', 'HPMS', 'Field', 'Manual', 'App', 'FHWA-HOP-13-042',
  // OpenStreetMap wiki, Key:lanes.
  'OSM', 'Key:lanes',
  // TRB Annual Meeting 2011 paper 11-4115.
  'TRB', 'Annual', 'Meeting',
  // Baker (1991), Int. J. Mass Emergencies and Disasters 9(2).
  'Baker', 'Int', 'J', 'Mass', 'Emergencies', 'Disasters',
  // Li, Ozbay, Bartin et al. (2013), Transportation Research Record 2376; the Rayleigh distribution.
  'Li', 'Ozbay', 'Bartin', 'TRR', 'Rayleigh',
  // Status marks (confirmed, common practice, computed) and the logistic curve's half-loading time H.
  'C', 'CP', 'X', 'H',
]);

function capitalisedWords(text: string): string[] {
  return text.match(/\b[A-Z][\w-]*(?::\w+)?/g) ?? [];
}

describe('model source texts', () => {
  it('cite only published references or say common practice / from memory', () => {
    const texts = modelSourceTexts();
    expect(texts.length).toBeGreaterThan(40);
    const unknown = texts.flatMap((t) => capitalisedWords(t).filter((w) => !ALLOWED_CAPITALISED.has(w)).map((w) => `${w} in "${t}"`));
    expect(unknown).toEqual([]);
  });

  it('would catch a source that names a program', () => {
    expect(capitalisedWords('capacity lookup of the Acme Demand Model (C)').filter((w) => !ALLOWED_CAPITALISED.has(w))).toEqual(['Acme', 'Demand', 'Model']);
  });

  it('mark each value confirmed, computed, common practice or from memory', () => {
    for (const t of modelSourceTexts()) expect(t).toMatch(/\((C|CP|X|M)\)|common practice|from memory|handbook capacities as they are/);
    expect(DEFAULT_CAPACITY_ROWS.find((r) => r.roadClass === 'motorway_link')!.capacitySource).toMatch(/common practice/);
  });
});
