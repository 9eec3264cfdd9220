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

/**
 * name="value" and name='value' pairs, in one pass: a regular expression here backtracked over
 * a long run of characters without "=", quadratic in the tag's length.
 */
function attributes(inner: string, work: { scanned: number }): Record<string, string> {
  const out: Record<string, string> = {};
  const n = inner.length;
  let i = 0;
  let steps = 0;
  const isSpace = (c: number) => c === 32 || c === 9 || c === 10 || c === 13;
  while (i < n) {
    const stepFrom = i;
    while (i < n && isSpace(inner.charCodeAt(i))) i++;
    const nameStart = i;
    while (i < n && !isSpace(inner.charCodeAt(i)) && inner.charCodeAt(i) !== 61 /* = */) i++;
    const name = inner.slice(nameStart, i);
    let j = i;
    while (j < n && isSpace(inner.charCodeAt(j))) j++;
    steps += j - stepFrom + 1;
    if (name === '' || inner.charCodeAt(j) !== 61) {
      // Not a pair: skip this character and go on, as a search for the next pair would.
      i = Math.max(i, nameStart + 1);
      continue;
    }
    j++;
    while (j < n && isSpace(inner.charCodeAt(j))) j++;
    const quote = inner.charCodeAt(j);
    if (quote !== 34 && quote !== 39) {
      i = j;
      continue;
    }
    const close = inner.indexOf(quote === 34 ? '"' : "'", j + 1);
    steps += (close < 0 ? n : close) - j;
    if (close < 0) break;
    out[name] = decodeEntities(inner.slice(j + 1, close));
    i = close + 1;
  }
  work.scanned += steps;
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

/** The longest element tag accepted, in characters (a real one is a few hundred at most). */
export const MAX_TAG_CHARACTERS = 64 * 1024;
/** The longest comment, processing instruction or declaration accepted. */
export const MAX_MARKUP_CHARACTERS = 1024 * 1024;

/** Incremental reader: push() byte chunks as they come, then end() for the document. */
export class OsmXmlReader {
  // Fatal: OSM XML is UTF-8, and a Latin-1 or UTF-16 file read as UTF-8 would garble names.
  private readonly decoder = new TextDecoder('utf-8', { fatal: true });
  private pending = '';
  // Where the scan of an unfinished tag at the start of `pending` goes on, and whether it is
  // inside a quoted value there: each character is looked at once, however the chunks fall.
  private resumeAt = 0;
  private resumeQuote = 0;
  private openMarkup: 'comment' | 'declaration' | null = null;
  private markupLength = 0;
  private readonly elements: OsmElement[] = [];
  private current: { type: 'node' | 'way' | 'relation'; attrs: Record<string, string>; tags: Record<string, string>; nodes: number[] } | null = null;
  private sawRoot = false;
  private sawRootEnd = false;
  /** Characters looked at while finding tags and reading attributes: linear in the text, for tests. */
  scanned = 0;

  push(chunk: Uint8Array): void {
    this.pending += this.decode(chunk, true);
    this.drain();
  }

  end(): OsmJson {
    this.pending += this.decode(new Uint8Array(0), false);
    this.drain();
    if (this.openMarkup) fail(`the file ends inside a ${this.openMarkup}`);
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

  /** Finds `needle` at or after `from`, counting the characters passed. */
  private find(s: string, needle: string, from: number): number {
    const at = s.indexOf(needle, from);
    this.scanned += (at < 0 ? s.length : at + needle.length) - from;
    return at;
  }

  private drain(): void {
    let s = this.pending;
    let pos = 0;
    // Inside a comment or declaration left open by the last chunk: its text is not kept (only
    // the last two characters, where "-->" may begin), just its length, for the cap.
    if (this.openMarkup) {
      const close = this.openMarkup === 'comment' ? '-->' : '>';
      const end = this.find(s, close, 0);
      if (end < 0) {
        this.markupLength += s.length - 2;
        if (this.markupLength > MAX_MARKUP_CHARACTERS) this.tooLong(s, 0, MAX_MARKUP_CHARACTERS, this.openMarkup);
        this.pending = s.slice(-2);
        return;
      }
      if (this.markupLength + end > MAX_MARKUP_CHARACTERS) this.tooLong(s, 0, MAX_MARKUP_CHARACTERS, this.openMarkup);
      this.openMarkup = null;
      pos = end + close.length;
    }
    // A tag left unfinished by the last chunk starts `pending`: its scan goes on where it stopped.
    let resumeAt = this.resumeAt;
    const resumeQuote = this.resumeQuote;
    this.resumeAt = 0;
    this.resumeQuote = 0;
    for (;;) {
      const lt = this.find(s, '<', pos);
      if (lt < 0) {
        pos = s.length;
        break;
      }
      const comment = s.startsWith('<!--', lt);
      if (comment || s.startsWith('<?', lt) || s.startsWith('<!', lt)) {
        // "<!-" or "<" alone at the very end may yet become a comment: wait for more.
        if (s.length - lt < 4 && '<!--'.startsWith(s.slice(lt))) {
          pos = lt;
          break;
        }
        const close = comment ? '-->' : '>';
        const from = lt + (comment ? 4 : 2);
        const end = this.find(s, close, from);
        if (end < 0) {
          this.openMarkup = comment ? 'comment' : 'declaration';
          this.markupLength = s.length - lt - 2;
          if (this.markupLength > MAX_MARKUP_CHARACTERS) this.tooLong(s, lt, MAX_MARKUP_CHARACTERS, this.openMarkup);
          pos = Math.max(from, s.length - 2);
          break;
        }
        if (end - lt > MAX_MARKUP_CHARACTERS) this.tooLong(s, lt, MAX_MARKUP_CHARACTERS, comment ? 'comment' : 'declaration');
        pos = end + close.length;
        resumeAt = 0;
        continue;
      }
      // Find the closing '>' outside quotes: attribute values may contain '>'.
      const resuming = lt === 0 && resumeAt > 0;
      let quote = resuming ? resumeQuote : 0;
      const start = resuming ? resumeAt : lt + 1;
      resumeAt = 0;
      let end = -1;
      let i = start;
      for (; i < s.length; i += 1) {
        const c = s.charCodeAt(i);
        if (quote !== 0) {
          if (c === quote) quote = 0;
        } else if (c === 34 || c === 39) quote = c;
        else if (c === 62) {
          end = i;
          break;
        }
      }
      this.scanned += i - start;
      if (end < 0) {
        if (s.length - lt > MAX_TAG_CHARACTERS) this.tooLong(s, lt, MAX_TAG_CHARACTERS, 'tag');
        this.resumeAt = s.length - lt;
        this.resumeQuote = quote;
        pos = lt;
        break;
      }
      if (end - lt > MAX_TAG_CHARACTERS) this.tooLong(s, lt, MAX_TAG_CHARACTERS, 'tag');
      this.element(s.slice(lt + 1, end));
      pos = end + 1;
    }
    s = s.slice(pos);
    this.pending = s;
  }

  private tooLong(s: string, lt: number, max: number, what: string): never {
    fail(`a ${what} longer than ${max.toLocaleString('en-US')} characters: ${preview(s.slice(lt, lt + 60))}`);
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
      this.current = { type: name, attrs: attributes(inner.slice(nameEnd), this), tags: {}, nodes: [] };
      if (selfClosing) this.finish();
      return;
    }
    if (!this.current) return;
    if (name === 'tag') {
      const a = attributes(inner.slice(nameEnd), this);
      if (a['k'] !== undefined) this.current.tags[a['k']] = a['v'] ?? '';
    } else if (name === 'nd' && this.current.type === 'way') {
      this.current.nodes.push(number(attributes(inner.slice(nameEnd), this)['ref'], 'nd ref'));
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
