// Which saved mappings fit a file: one made for the same columns first, then any whose chosen
// columns the file all has; one naming a column the file lacks, or of another kind, is left out.
import { describe, expect, it } from 'vitest';
import { columnsUsed, presetsForFile } from '../../shared/api/mapping-presets';

const roads = (name: string, fieldNames: string[], roadClass: string, lanes?: string) => ({ name, kind: 'roads' as const, fieldNames, mapping: { roads: { roadClass, lanes, classValues: {}, onewayValues: {}, speedUnit: 'kmh' as const } } });

describe('presetsForFile', () => {
  const exact = roads('exact', ['A', 'B', 'C'], 'A', 'B');
  const subset = roads('subset', ['A', 'Z'], 'A');
  const missing = roads('missing', ['A', 'B'], 'A', 'Q');
  const zones = { name: 'zones', kind: 'zones' as const, fieldNames: ['A', 'B', 'C'], mapping: { zones: { population: 'A' } } };
  it('ranks the same columns first and leaves out what does not fit', () => {
    expect(presetsForFile([subset, missing, zones, exact], 'roads', ['C', 'B', 'A']).map((p) => p.name)).toEqual(['exact', 'subset']);
  });
  it('names the columns a preset uses', () => {
    expect(columnsUsed(exact)).toEqual(['A', 'B']);
    expect(columnsUsed({ kind: 'shelters', mapping: { source: { xColumn: 'X', yColumn: 'Y' }, shelters: { capacityPersons: 'CAP' } } })).toEqual(['X', 'Y', 'CAP']);
  });
});
