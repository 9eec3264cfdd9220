// The result colours: band edges, out-of-range values, wider lines for busier arcs.
import { describe, expect, it } from 'vitest';
import { chokePointColor, utilisationBand, utilisationBands, utilisationColor, utilisationStyle } from '../../src/map/utilisation-scale';

describe('utilisation scale', () => {
  it('puts each value in the band whose lower edge it reaches', () => {
    expect(utilisationBand(0).label).toBe('No flow');
    expect(utilisationBand(0.001).label).toBe('Under 25 %');
    expect(utilisationBand(0.25).label).toBe('25–50 %');
    expect(utilisationBand(0.7499).label).toBe('50–75 %');
    expect(utilisationBand(0.75).label).toBe('75–95 %');
    expect(utilisationBand(0.95).label).toBe('95 % and over');
    expect(utilisationBand(1.3).label).toBe('95 % and over');
  });

  it('treats a missing or negative value as no flow', () => {
    expect(utilisationColor(Number.NaN)).toBe(utilisationBands[0]!.color);
    expect(utilisationColor(-1)).toBe(utilisationBands[0]!.color);
  });

  it('has distinct colours, none of them the choke-point colour', () => {
    const colors = utilisationBands.map((b) => b.color);
    expect(new Set(colors).size).toBe(colors.length);
    expect(colors).not.toContain(chokePointColor);
  });

  it('draws busier arcs wider, idle ones thin and faint', () => {
    expect(utilisationStyle(1, 2).weight).toBeGreaterThan(utilisationStyle(0.3, 2).weight);
    expect(utilisationStyle(0, 2).weight).toBeLessThan(2);
    expect(utilisationStyle(0, 2).opacity).toBeLessThan(utilisationStyle(0.5, 2).opacity);
    expect(utilisationStyle(5, 2).weight).toBe(utilisationStyle(1, 2).weight);
  });
});
