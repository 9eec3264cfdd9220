// The import report of the demo town's roads (built by the same code the server uses), as the
// Roads tab lists it: kept and dropped features, dead ends with a place to show on the map.
import { describe, expect, it } from 'vitest';
import { buildRoadGraph } from '../../shared/geo/build-road-graph';
import { importReportSchema, type ImportReport } from '../../shared/api/road-import';
import roadsText from '../../server/seed/demo-town/roads.geojson?raw';
import { badFeatureLines, dropReasonWords, importReportSections, importSummary } from '../../src/format/import-report';

const roads: unknown = JSON.parse(roadsText);
const report: ImportReport = importReportSchema.parse(buildRoadGraph(roads).report);

describe('import report sections', () => {
  it('summarises the import in one sentence', () => {
    expect(importSummary(report)).toMatch(/^[\d,]+ segments and [\d,]+ junctions \([\d.,]+ k?m of road\) from [\d,]+ features, GeoJSON\.$/);
  });

  it('lists what was kept, by class, adding up to every segment', () => {
    const kept = importReportSections(report).find((s) => s.key === 'kept')!;
    expect(kept.items).toHaveLength(report.kept.length);
    expect(report.kept.reduce((s, k) => s + k.segments, 0)).toBe(report.segmentCount);
  });

  it('says why features were left out (the demo has a footway and a river)', () => {
    const dropped = importReportSections(report).find((s) => s.key === 'dropped')!;
    expect(dropped.items.map((i) => i.text).join(' ')).toContain(dropReasonWords.notDrivableClass);
  });

  it('gives every dead end a point to show on the map', () => {
    const section = importReportSections(report).find((s) => s.key === 'dangling');
    if (report.danglingEnds.length === 0) {
      expect(section).toBeUndefined();
      return;
    }
    expect(section!.items.length + section!.more).toBe(report.danglingEnds.length);
    for (const item of section!.items) expect(item.location?.kind).toBe('point');
  });

  it('warns about separate parts and cuts long lists', () => {
    const many: ImportReport = {
      ...report,
      components: Array.from({ length: 60 }, (_, i) => ({ id: i, nodes: 2, segments: 1, lengthMeters: 10, shareOfLength: 1 / 60, bbox: [0, 0, 1, 1] as [number, number, number, number] })),
    };
    const section = importReportSections(many).find((s) => s.key === 'components')!;
    expect(section.severity).toBe('warning');
    expect(section.items).toHaveLength(40);
    expect(section.more).toBe(20);
    expect(section.items[0]!.location).toEqual({ kind: 'bbox', bbox: [0, 0, 1, 1] });
  });

  it('lists a refused file feature by feature, counting from one', () => {
    expect(badFeatureLines([{ index: 0, id: 'way/5', problem: 'a line needs two positions' }, { index: 4, id: null, problem: 'no geometry' }])).toEqual([
      'Feature 1 (way/5): a line needs two positions',
      'Feature 5: no geometry',
    ]);
  });
});
