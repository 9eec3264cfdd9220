// Just enough of the PDF file structure to check a signature: the cross-reference tables
// (classic ones, as pdfkit and @signpdf write them, following /Prev through incremental
// updates), indirect objects that are not streams, and the value syntax (dictionaries, arrays,
// names, strings, numbers, references). Objects inside compressed object streams are not read;
// a file rewritten that way by another program simply shows no readable signature here.
// No package on hand parses PDF objects (pdfkit only writes), hence this small reader.

export type PdfValue =
  | { kind: 'name'; value: string }
  | { kind: 'string'; bytes: Buffer; start: number; end: number }
  | { kind: 'number'; value: number }
  | { kind: 'bool'; value: boolean }
  | { kind: 'null' }
  | { kind: 'ref'; num: number; gen: number }
  | { kind: 'array'; items: PdfValue[] }
  | { kind: 'dict'; entries: Map<string, PdfValue> };

export class PdfReadError extends Error {}

const WHITESPACE = new Set([0x00, 0x09, 0x0a, 0x0c, 0x0d, 0x20]);
const DELIMITERS = new Set([...'()<>[]{}/%'].map((c) => c.charCodeAt(0)));

export class PdfParser {
  pos: number;
  constructor(
    readonly buf: Buffer,
    start = 0,
  ) {
    this.pos = start;
  }

  private peek(offset = 0): number {
    return this.buf[this.pos + offset] ?? -1;
  }

  skipWhitespace(): void {
    for (;;) {
      const c = this.peek();
      if (WHITESPACE.has(c)) this.pos++;
      else if (c === 0x25 /* % */) {
        while (this.pos < this.buf.length && this.peek() !== 0x0a && this.peek() !== 0x0d) this.pos++;
      } else return;
    }
  }

  /** A bare word: a number, a keyword (obj, R, true…) or the characters of a name. */
  word(): string {
    const start = this.pos;
    while (this.pos < this.buf.length && !WHITESPACE.has(this.peek()) && !DELIMITERS.has(this.peek())) this.pos++;
    return this.buf.toString('latin1', start, this.pos);
  }

  expectKeyword(keyword: string): void {
    this.skipWhitespace();
    const w = this.word();
    if (w !== keyword) throw new PdfReadError(`expected "${keyword}" at ${this.pos}, found "${w}"`);
  }

  value(): PdfValue {
    this.skipWhitespace();
    const c = this.peek();
    if (c === 0x3c /* < */ && this.peek(1) === 0x3c) return this.dictionary();
    if (c === 0x3c) return this.hexString();
    if (c === 0x28 /* ( */) return this.literalString();
    if (c === 0x2f /* / */) {
      this.pos++;
      return { kind: 'name', value: this.word().replace(/#([0-9a-fA-F]{2})/g, (_, h: string) => String.fromCharCode(parseInt(h, 16))) };
    }
    if (c === 0x5b /* [ */) {
      this.pos++;
      const items: PdfValue[] = [];
      for (;;) {
        this.skipWhitespace();
        if (this.peek() === 0x5d) {
          this.pos++;
          return { kind: 'array', items };
        }
        if (this.pos >= this.buf.length) throw new PdfReadError('unterminated array');
        items.push(this.value());
      }
    }
    const w = this.word();
    if (w === 'true' || w === 'false') return { kind: 'bool', value: w === 'true' };
    if (w === 'null') return { kind: 'null' };
    if (!/^[+-]?(\d+\.?\d*|\.\d+)$/.test(w)) throw new PdfReadError(`unexpected "${w || String.fromCharCode(c)}" at ${this.pos}`);
    // "12 0 R" is a reference: look ahead without consuming unless it matches.
    if (/^\d+$/.test(w)) {
      const save = this.pos;
      this.skipWhitespace();
      const gen = this.word();
      this.skipWhitespace();
      if (/^\d+$/.test(gen) && this.word() === 'R') return { kind: 'ref', num: Number(w), gen: Number(gen) };
      this.pos = save;
    }
    return { kind: 'number', value: Number(w) };
  }

  private dictionary(): PdfValue {
    this.pos += 2;
    const entries = new Map<string, PdfValue>();
    for (;;) {
      this.skipWhitespace();
      if (this.peek() === 0x3e && this.peek(1) === 0x3e) {
        this.pos += 2;
        return { kind: 'dict', entries };
      }
      const key = this.value();
      if (key.kind !== 'name') throw new PdfReadError(`dictionary key is not a name at ${this.pos}`);
      entries.set(key.value, this.value());
    }
  }

  private hexString(): PdfValue {
    const start = this.pos;
    const end = this.buf.indexOf(0x3e, start);
    if (end < 0) throw new PdfReadError('unterminated hex string');
    const digits = this.buf.toString('latin1', start + 1, end).replace(/\s+/g, '');
    if (!/^[0-9a-fA-F]*$/.test(digits)) throw new PdfReadError(`bad hex string at ${start}`);
    this.pos = end + 1;
    return { kind: 'string', bytes: Buffer.from(digits.length % 2 ? `${digits}0` : digits, 'hex'), start, end: this.pos };
  }

  private literalString(): PdfValue {
    const start = this.pos;
    this.pos++;
    const out: number[] = [];
    let depth = 1;
    const escapes: Record<number, number> = { 0x6e: 0x0a, 0x72: 0x0d, 0x74: 0x09, 0x62: 0x08, 0x66: 0x0c };
    while (this.pos < this.buf.length) {
      const c = this.buf[this.pos++]!;
      if (c === 0x5c /* \ */) {
        const e = this.buf[this.pos++]!;
        if (escapes[e] !== undefined) out.push(escapes[e]);
        else if (e >= 0x30 && e <= 0x37) {
          let oct = e - 0x30;
          for (let i = 0; i < 2 && this.peek() >= 0x30 && this.peek() <= 0x37; i++) oct = oct * 8 + (this.buf[this.pos++]! - 0x30);
          out.push(oct & 0xff);
        } else if (e === 0x0d) {
          if (this.peek() === 0x0a) this.pos++;
        } else if (e !== 0x0a) out.push(e);
      } else if (c === 0x28) {
        depth++;
        out.push(c);
      } else if (c === 0x29) {
        if (--depth === 0) return { kind: 'string', bytes: Buffer.from(out), start, end: this.pos };
        out.push(c);
      } else out.push(c);
    }
    throw new PdfReadError('unterminated string');
  }
}

/** Text of a PDF string: UTF-16BE with a byte-order mark, else PDFDocEncoding (read as Latin-1). */
export function pdfText(v: PdfValue | undefined): string | null {
  if (!v || v.kind !== 'string') return null;
  const b = v.bytes;
  if (b.length >= 2 && b[0] === 0xfe && b[1] === 0xff) return Buffer.from(b.subarray(2)).swap16().toString('utf16le');
  if (b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) return b.subarray(3).toString('utf8');
  return b.toString('latin1');
}

/** "D:20261202140533Z" or "D:20261202140533+01'00'" to a Date. */
export function pdfDate(text: string | null): Date | null {
  const m = text?.match(/^D:(\d{4})(\d{2})?(\d{2})?(\d{2})?(\d{2})?(\d{2})?(Z|[+-]\d{2}'?\d{2}'?)?/);
  if (!m) return null;
  const [, y, mo = '01', d = '01', h = '00', mi = '00', s = '00', tz = 'Z'] = m;
  const zone = tz === 'Z' ? 'Z' : `${tz.slice(0, 3)}:${tz.replace(/'/g, '').slice(3, 5)}`;
  const date = new Date(`${y}-${mo}-${d}T${h}:${mi}:${s}${zone}`);
  return Number.isNaN(date.getTime()) ? null : date;
}

export type PdfDocument = {
  buf: Buffer;
  /** Object number → byte offset of "n g obj", newest revision first. */
  offsets: Map<number, number>;
  trailer: Map<string, PdfValue>;
  /** How the object table was found: from the xref tables, or by scanning (damaged file). */
  via: 'xref' | 'scan';
};

function readXrefChain(buf: Buffer): Omit<PdfDocument, 'buf' | 'via'> {
  const tail = buf.toString('latin1', Math.max(0, buf.length - 1024));
  const m = /startxref\s+(\d+)\s+%%EOF\s*$/.exec(tail);
  if (!m) throw new PdfReadError('no startxref at the end of the file');
  const offsets = new Map<number, number>();
  let trailer: Map<string, PdfValue> | null = null;
  const seen = new Set<number>();
  let at: number | null = Number(m[1]);
  while (at !== null) {
    if (seen.has(at) || at >= buf.length) throw new PdfReadError('broken xref chain');
    seen.add(at);
    const p: PdfParser = new PdfParser(buf, at);
    p.expectKeyword('xref');
    for (;;) {
      p.skipWhitespace();
      const first = p.word();
      if (first === 'trailer') break;
      p.skipWhitespace();
      const count = Number(p.word());
      if (!/^\d+$/.test(first) || !Number.isInteger(count)) throw new PdfReadError('bad xref subsection');
      for (let i = 0; i < count; i++) {
        p.skipWhitespace();
        const offset = Number(p.word());
        p.skipWhitespace();
        p.word();
        p.skipWhitespace();
        const type = p.word();
        const num = Number(first) + i;
        if (type === 'n' && !offsets.has(num)) offsets.set(num, offset);
        else if (type === 'f' && !offsets.has(num)) offsets.set(num, -1);
      }
    }
    const dict: PdfValue = p.value();
    if (dict.kind !== 'dict') throw new PdfReadError('trailer is not a dictionary');
    trailer ??= dict.entries;
    const prev: PdfValue | undefined = dict.entries.get('Prev');
    at = prev?.kind === 'number' ? prev.value : null;
  }
  for (const [k, v] of offsets) if (v < 0) offsets.delete(k);
  return { offsets, trailer: trailer! };
}

function scanObjects(buf: Buffer): Omit<PdfDocument, 'buf' | 'via'> {
  const text = buf.toString('latin1');
  const offsets = new Map<number, number>();
  for (const m of text.matchAll(/(?:^|[\r\n])(\d+)\s+(\d+)\s+obj\b/g)) offsets.set(Number(m[1]), m.index + (m[0].length - m[0].trimStart().length));
  const trailers = [...text.matchAll(/trailer\s*<</g)];
  const last = trailers[trailers.length - 1];
  let trailer = new Map<string, PdfValue>();
  if (last) {
    const v = new PdfParser(buf, last.index + 'trailer'.length).value();
    if (v.kind === 'dict') trailer = v.entries;
  }
  return { offsets, trailer };
}

export function openPdf(buf: Buffer): PdfDocument {
  if (buf.subarray(0, 5).toString('latin1') !== '%PDF-') throw new PdfReadError('not a PDF file');
  try {
    return { buf, ...readXrefChain(buf), via: 'xref' };
  } catch {
    return { buf, ...scanObjects(buf), via: 'scan' };
  }
}

export function readObject(doc: PdfDocument, num: number): PdfValue | null {
  const offset = doc.offsets.get(num);
  if (offset === undefined) return null;
  const p = new PdfParser(doc.buf, offset);
  p.skipWhitespace();
  if (Number(p.word()) !== num) return null;
  p.skipWhitespace();
  p.word();
  p.expectKeyword('obj');
  return p.value();
}

/** Follows references (a few levels at most, against loops). */
export function resolve(doc: PdfDocument, v: PdfValue | undefined | null, depth = 0): PdfValue | null {
  if (!v) return null;
  if (v.kind !== 'ref') return v;
  if (depth > 8) return null;
  return resolve(doc, readObject(doc, v.num), depth + 1);
}

export function dictOf(v: PdfValue | null): Map<string, PdfValue> | null {
  return v?.kind === 'dict' ? v.entries : null;
}
