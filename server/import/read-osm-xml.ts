// OpenStreetMap XML (the .osm format of the OSM API 0.6 and osmium/osmconvert exports) →
// OSM JSON, read in chunks so that the text is never held whole. osmtogeojson reads XML only
// through a DOM, which for a county-sized file would cost many times the file's size; this
// reader keeps just the nodes and ways.
import { preview } from '../../shared/geo/check-feature-collection';
import { RoadImportError } from '../../shared/geo/road-import-error';
import type { OsmElement, OsmJson } from './osm-json';

const ENTITY: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

// XML's Char production (XML 1.0 §2.2): no NUL, no other C0 control but tab, LF and CR.
function isXmlChar(code: number): boolean {
  return code === 0x9 || code === 0xa || code === 0xd || (code >= 0x20 && code <= 0xd7ff) || (code >= 0xe000 && code <= 0xfffd) || (code >= 0x10000 && code <= 0x10ffff);
}

function decodeEntities(s: string): string {
  if (!s.includes('&')) return s;
  return s.replace(/&(#x[0-9a-fA-F]+|#[0-9]+|[a-z]+);/g, (whole, name: string) => {
    if (!name.startsWith('#')) return ENTITY[name] ?? whole;
    const code = name.startsWith('#x') ? parseInt(name.slice(2), 16) : parseInt(name.slice(1), 10);
    if (!isXmlChar(code)) fail(`the character reference ${whole} is not a character XML allows`);
    return String.fromCodePoint(code);
  });
}

const ATTRIBUTE = /([^\s=]+)\s*=\s*(?:"([^"]*)"|'([^']*)')/g;

function attributes(inner: string): Record<string, string> {
  const out: Record<string, string> = {};
  ATTRIBUTE.lastIndex = 0;
  for (let m = ATTRIBUTE.exec(inner); m; m = ATTRIBUTE.exec(inner)) {
    out[m[1]!] = decodeEntities(m[2] ?? m[3] ?? '');
  }
  return out;
}

function fail(message: string): never {
  throw new RoadImportError('unreadableFile', `OpenStreetMap XML: ${message}`);
}

function number(value: string | undefined, what: string): number {
  const n = Number(value);
  if (value === undefined || value.trim() === '' || !Number.isFinite(n)) fail(`${what} is not a number: ${value === undefined ? 'missing' : preview(value)}`);
  return n;
}

/** Incremental reader: push() byte chunks as they come, then end() for the document. */
export class OsmXmlReader {
  // Fatal: OSM XML is UTF-8, and a Latin-1 or UTF-16 file read as UTF-8 would garble names.
  private readonly decoder = new TextDecoder('utf-8', { fatal: true });
  private pending = '';
  private readonly elements: OsmElement[] = [];
  private current: { type: 'node' | 'way' | 'relation'; attrs: Record<string, string>; tags: Record<string, string>; nodes: number[] } | null = null;
  private sawRoot = false;
  private sawRootEnd = false;

  push(chunk: Uint8Array): void {
    this.pending += this.decode(chunk, true);
    this.drain();
  }

  end(): OsmJson {
    this.pending += this.decode(new Uint8Array(0), false);
    this.drain();
    if (this.pending.includes('<')) fail('the file ends inside a tag');
    if (!this.sawRoot) fail('no <osm> element: this is not an OpenStreetMap XML file');
    if (this.current) fail(`the file ends inside <${this.current.type} id="${this.current.attrs['id'] ?? '?'}">`);
    // Without the closing tag the file was cut short, maybe between two ways: refuse it
    // rather than import part of the area.
    if (!this.sawRootEnd) fail('the file ends before </osm>: it looks cut short');
    return { elements: this.elements };
  }

  private decode(chunk: Uint8Array, stream: boolean): string {
    let text: string;
    try {
      text = this.decoder.decode(chunk, { stream });
    } catch {
      fail('the file is not UTF-8 text (OpenStreetMap XML is always UTF-8)');
    }
    if (text.includes('\u0000')) fail('the file contains NUL characters: it is not a text file');
    return text;
  }

  private drain(): void {
    const s = this.pending;
    let pos = 0;
    for (;;) {
      const lt = s.indexOf('<', pos);
      if (lt < 0) {
        pos = s.length;
        break;
      }
      let end: number;
      if (s.startsWith('<!--', lt)) {
        end = s.indexOf('-->', lt + 4);
        if (end < 0) break;
        pos = end + 3;
        continue;
      }
      if (s.startsWith('<?', lt) || s.startsWith('<!', lt)) {
        end = s.indexOf('>', lt + 2);
        if (end < 0) break;
        pos = end + 1;
        continue;
      }
      // Find the closing '>' outside quotes: attribute values may contain '>'.
      let quote = 0;
      end = -1;
      for (let i = lt + 1; i < s.length; i += 1) {
        const c = s.charCodeAt(i);
        if (quote !== 0) {
          if (c === quote) quote = 0;
        } else if (c === 34 || c === 39) quote = c;
        else if (c === 62) {
          end = i;
          break;
        }
      }
      if (end < 0) break;
      this.element(s.slice(lt + 1, end));
      pos = end + 1;
    }
    this.pending = s.slice(pos);
  }

  private element(body: string): void {
    const closing = body.startsWith('/');
    const selfClosing = body.endsWith('/');
    const inner = body.slice(closing ? 1 : 0, selfClosing ? -1 : undefined);
    const nameEnd = inner.search(/[\s/]|$/);
    const name = inner.slice(0, nameEnd);
    if (closing) {
      if (this.current && name === this.current.type) this.finish();
      if (name === 'osm') this.sawRootEnd = true;
      return;
    }
    if (name === 'osm' || name === 'osmChange') {
      if (name === 'osmChange') fail('this is a change file (osmChange), not a map extract');
      this.sawRoot = true;
      if (selfClosing) this.sawRootEnd = true;
      return;
    }
    if (name === 'node' || name === 'way' || name === 'relation') {
      if (this.current) fail(`<${name}> inside <${this.current.type}>`);
      this.current = { type: name, attrs: attributes(inner.slice(nameEnd)), tags: {}, nodes: [] };
      if (selfClosing) this.finish();
      return;
    }
    if (!this.current) return;
    if (name === 'tag') {
      const a = attributes(inner.slice(nameEnd));
      if (a['k'] !== undefined) this.current.tags[a['k']] = a['v'] ?? '';
    } else if (name === 'nd' && this.current.type === 'way') {
      this.current.nodes.push(number(attributes(inner.slice(nameEnd))['ref'], 'nd ref'));
    }
  }

  private finish(): void {
    const c = this.current!;
    this.current = null;
    if (c.attrs['action'] === 'delete' || c.attrs['visible'] === 'false') return;
    const id = number(c.attrs['id'], `${c.type} id`);
    const tags = Object.keys(c.tags).length > 0 ? c.tags : undefined;
    if (c.type === 'node') {
      this.elements.push({ type: 'node', id, lat: number(c.attrs['lat'], `node ${id} lat`), lon: number(c.attrs['lon'], `node ${id} lon`), ...(tags ? { tags } : {}) });
    } else if (c.type === 'way') {
      this.elements.push({ type: 'way', id, nodes: c.nodes, ...(tags ? { tags } : {}) });
    } else {
      this.elements.push({ type: 'relation', id, ...(tags ? { tags } : {}) });
    }
  }
}

const CHUNK_BYTES = 1 << 20;

/** Reads a whole OSM XML document held in memory, a chunk at a time. */
export function readOsmXml(bytes: Uint8Array): OsmJson {
  const reader = new OsmXmlReader();
  for (let i = 0; i < bytes.length; i += CHUNK_BYTES) reader.push(bytes.subarray(i, i + CHUNK_BYTES));
  return reader.end();
}
