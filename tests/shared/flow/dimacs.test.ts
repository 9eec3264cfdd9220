// The max-flow format of the 1st DIMACS Implementation Challenge ("p max N M", "n ID s",
// "n ID t", "a U V CAP", "c" comments; 1-based ids): reading and writing round-trip, the CLRS
// Fig. 26.1 instance read from a file gives 23, and every malformed line is reported by number.
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  DimacsParseError,
  buildNetworkFromArrays,
  formatDimacsMaxFlow,
  maxFlow,
  networkToDimacs,
  parseDimacsMaxFlow,
  type DimacsMaxFlow,
} from '../../../shared/flow';
import { randomGraph } from './support/random-graphs';

const fixture = (name: string): string => readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8');

describe('DIMACS max-flow format', () => {
  it('reads the CLRS 3rd ed. Fig. 26.1 instance (value 23)', () => {
    const instance = parseDimacsMaxFlow(fixture('clrs-26-1.max'));
    expect(instance.nodeCount).toBe(6);
    expect(instance.tails.length).toBe(9);
    const network = buildNetworkFromArrays(instance.nodeCount, instance.tails, instance.heads, instance.capacities);
    expect(maxFlow(network, instance.source, instance.sink).value).toBe(23);
  });

  it('round-trips random instances through text, and through a network', () => {
    fc.assert(
      fc.property(randomGraph({ maxNodes: 12, maxArcs: 40 }), fc.array(fc.string({ unit: 'grapheme-ascii' }).map((s) => s.replace(/\n/g, ' ')), { maxLength: 3 }), (graph, comments) => {
        if (graph.source === graph.sink) return;
        const instance: DimacsMaxFlow = {
          nodeCount: graph.nodeCount,
          source: graph.source,
          sink: graph.sink,
          tails: Int32Array.from(graph.arcs, (a) => a.from),
          heads: Int32Array.from(graph.arcs, (a) => a.to),
          capacities: Int32Array.from(graph.arcs, (a) => a.capacity),
        };
        const text = formatDimacsMaxFlow(instance, comments);
        expect(parseDimacsMaxFlow(text)).toEqual(instance);
        const network = buildNetworkFromArrays(instance.nodeCount, instance.tails, instance.heads, instance.capacities);
        expect(networkToDimacs(network, instance.source, instance.sink)).toEqual(instance);
      }),
      { numRuns: 200, seed: 1991 },
    );
  });

  it('accepts comments, blank lines, tabs and Windows line ends anywhere', () => {
    const text = 'c header\r\n\r\np\tmax 2 1\r\nc between\r\nn 1 s\r\nn 2 t\r\n  a 1  2\t7\r\nc end\r\n';
    expect(parseDimacsMaxFlow(text).capacities).toEqual(Int32Array.from([7]));
  });

  const malformed: [string, string, number, RegExp][] = [
    ['no problem line', 'c nothing here\n', 1, /no problem line/],
    ['an arc before the problem line', 'a 1 2 3\np max 2 1\n', 1, /before "a"/],
    ['a problem line of another kind', 'p min 2 1\n', 1, /expected "p max/],
    ['a second problem line', 'p max 2 0\nn 1 s\np max 2 0\n', 3, /second problem line/],
    ['a node id out of range', 'p max 2 1\nn 3 s\n', 2, /outside 1\.\.2/],
    ['an unknown designator', 'p max 2 1\nn 1 x\n', 2, /must be s or t/],
    ['two sources', 'p max 3 0\nn 1 s\nn 2 s\n', 3, /second source/],
    ['source equal to sink', 'p max 2 0\nn 1 s\nn 1 t\n', 3, /same node/],
    ['a negative capacity', 'p max 2 1\nn 1 s\nn 2 t\na 1 2 -4\n', 4, /non-negative integer/],
    ['a fractional capacity', 'p max 2 1\nn 1 s\nn 2 t\na 1 2 2.5\n', 4, /non-negative integer/],
    ['a capacity beyond the unbounded stand-in', 'p max 2 1\nn 1 s\nn 2 t\na 1 2 2147483648\n', 4, /exceeds/],
    ['a short arc line', 'p max 2 1\nn 1 s\nn 2 t\na 1 2\n', 4, /expected "a <from>/],
    ['more arcs than announced', 'p max 2 1\nn 1 s\nn 2 t\na 1 2 1\na 2 1 1\n', 5, /more arcs than the 1/],
    ['fewer arcs than announced (reported at the last line)', 'p max 2 2\nn 1 s\nn 2 t\na 1 2 1\n', 4, /1 arcs found, 2 announced/],
    ['a missing sink (reported at the last line)', 'p max 2 1\nn 1 s\na 1 2 1\n', 3, /no sink line/],
    ['an unknown line type', 'p max 2 1\nx 1 2\n', 2, /unknown line type "x"/],
  ];
  for (const [what, text, line, message] of malformed) {
    it(`reports ${what} with its line number`, () => {
      let error: unknown;
      try {
        parseDimacsMaxFlow(text);
      } catch (e) {
        error = e;
      }
      expect(error).toBeInstanceOf(DimacsParseError);
      expect((error as DimacsParseError).line).toBe(line);
      expect((error as DimacsParseError).message).toMatch(message);
      expect((error as DimacsParseError).message).toMatch(new RegExp(`^line ${line}: `));
    });
  }
});
