// The OSM XML reader reads a file in chunks. An unfinished tag used to be rescanned from its
// start after every chunk, and attributes were found with a regular expression that backtracked
// over long runs without "=": both quadratic, so one small gzip that expands to a long tag could
// hold the API for minutes. Work is counted here in characters looked at (the reader's
// `scanned`), not timed: it must stay within a small multiple of the text's length however the
// chunks fall, and a tag (or comment) beyond its cap is refused.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MAX_MARKUP_CHARACTERS, MAX_TAG_CHARACTERS, OsmXmlReader, readOsmXml } from '../../../server/import/read-osm-xml';
import { RoadImportError } from '../../../shared/geo/road-import-error';

const encoder = new TextEncoder();

function readInChunks(text: string, chunkChars: number) {
  const reader = new OsmXmlReader();
  const bytes = encoder.encode(text);
  for (let i = 0; i < bytes.length; i += chunkChars) reader.push(bytes.subarray(i, i + chunkChars));
  return { reader, osm: reader.end() };
}

const document = (body: string) => `<?xml version="1.0" encoding="UTF-8"?>\n<osm version="0.6">\n${body}\n</osm>\n`;

describe('the OSM XML reader', () => {
  it('looks at each character a bounded number of times when a long tag spans many chunks', () => {
    // One way whose opening tag is 60,000 characters (an attribute value), fed 1,000 bytes at a time:
    // rescanning from the tag's start after each chunk would look at about 1.8 million characters.
    const long = 'x'.repeat(60_000);
    const text = document(`<node id="1" lat="50" lon="10"/><node id="2" lat="50.001" lon="10"/><way id="7" note="${long}"><nd ref="1"/><nd ref="2"/><tag k="highway" v="primary"/></way>`);
    const { reader, osm } = readInChunks(text, 1000);
    expect(osm.elements.find((e) => e.type === 'way')).toMatchObject({ id: 7, nodes: [1, 2], tags: { highway: 'primary' } });
    expect(reader.scanned).toBeLessThan(3 * text.length);
    expect(reader.scanned).toBeGreaterThan(text.length / 2);
  });

  it('looks at a long comment once, however it is split', () => {
    const text = document(`<!-- ${'comment '.repeat(100_000)} --><node id="1" lat="50" lon="10"/>`);
    const { reader, osm } = readInChunks(text, 997);
    expect(osm.elements).toHaveLength(1);
    expect(reader.scanned).toBeLessThan(3 * text.length);
  });

  it('reads attributes in one pass, even over a long run without "="', () => {
    // A regular expression for name="value" pairs backtracked here: 60,000² steps.
    const text = document(`<node id="1" lat="50" lon="10" ${'a'.repeat(60_000)}/>`);
    const { reader, osm } = readInChunks(text, 1 << 20);
    expect(osm.elements).toEqual([{ type: 'node', id: 1, lat: 50, lon: 10 }]);
    expect(reader.scanned).toBeLessThan(4 * text.length);
  });

  it('refuses a tag longer than its cap, and a comment longer than its cap, with a reason', () => {
    const tag = document(`<way id="1" note="${'y'.repeat(MAX_TAG_CHARACTERS)}"></way>`);
    for (const chunk of [1000, 1 << 20]) {
      expect(() => readInChunks(tag, chunk)).toThrow(RoadImportError);
      expect(() => readInChunks(tag, chunk)).toThrow(/a tag longer than 65,536 characters/);
    }
    const comment = document(`<!-- ${'z'.repeat(MAX_MARKUP_CHARACTERS)} -->`);
    expect(() => readInChunks(comment, 4096)).toThrow(/a comment longer than 1,048,576 characters/);
  });

  it('reads the same elements whatever the chunk size (quotes, comments and tags split anywhere)', () => {
    const text = document(
      [
        '<!-- a comment with <tags> and "quotes" inside -->',
        '<node id="1" lat="50" lon="10"><tag k="name" v="A &amp; B &gt; C"/></node>',
        "<node id='2' lat='50.001' lon='10.001' note='has > inside'/>",
        '<way id="3"><nd ref="1"/><nd ref="2"/><tag k="highway" v="residential"/><tag k="name" v="Rue &quot;Ö&quot; ✓"/></way>',
        '<?processing instruction?>',
        '<relation id="4"><tag k="type" v="route"/></relation>',
      ].join('\n'),
    );
    const whole = readOsmXml(encoder.encode(text));
    expect(whole.elements).toHaveLength(4);
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 64 }), (size) => {
        const { reader, osm } = readInChunks(text, size);
        expect(osm).toEqual(whole);
        expect(reader.scanned).toBeLessThan(4 * text.length);
      }),
      { numRuns: 64 },
    );
  });
});
