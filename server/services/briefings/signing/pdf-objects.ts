// Just enough of the PDF file structure to check a signature: the cross-reference tables
// (classic ones, as pdfkit and @signpdf write them, following /Prev through incremental
// updates), indirect objects that are not streams, and the value syntax (dictionaries, arrays,
// names, strings, numbers, references). Objects inside compressed object streams are not read;
// a file rewritten that way by another program simply shows no readable signature here.
// No package on hand parses PDF objects (pdfkit only writes), hence this small reader.
//
// Anyone may upload a PDF to check, so every loop here is bounded by the bytes of the file:
// counts read from the file never drive a loop by themselves, nesting and word lengths are
// capped, and all parsing for one document draws on one work budget (twice the file's size
// and a little), so objects that overlap or point at each other cannot multiply the work.

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
/** The file asks for more parsing than its size justifies: refused, never retried. */
export class PdfTooComplexError extends PdfReadError {}

/** Bytes of parsing one document may still spend, shared by every parser working on it. */
export type WorkBudget = { left: number };
export const workBudgetFor = (buf: Buffer): WorkBudget => ({ left: 2 * buf.length + 65_536 });

/** Deeper arrays and dictionaries than this are refused (the reader recurses). */
const MAX_NESTING = 64;
/** Names are at most 127 bytes (ISO 32000-1, Annex C); numbers and keywords are shorter. */
const MAX_WORD = 1024;

// Byte classes as a table (1 whitespace, 2 delimiter): the reader looks at every byte it passes.
const CLASS = new Uint8Array(256);
for (const c of [0x00, 0x09, 0x0a, 0x0c, 0x0d, 0x20]) CLASS[c] = 1;
for (const c of '()<>[]{}/%') CLASS[c.charCodeAt(0)] = 2;
const WHITESPACE = { has: (c: number) => c >= 0 && CLASS[c] === 1 };
const DELIMITERS = { has: (c: number) => c >= 0 && CLASS[c] === 2 };

export class PdfParser {
  pos: number;
  private depth = 0;
  constructor(
    readonly buf: Buffer,
    start = 0,
    readonly budget: WorkBudget = workBudgetFor(buf),
  ) {
    if (budget.left <= 0) throw new PdfTooComplexError('the file needs more work to read than its size allows');
    this.pos = start;
  }

  /** Charges what this parser consumed since `from` to the document's budget. */
  charge(from: number): void {
    this.budget.left -= Math.max(0, this.pos - from) + 16;
    if (this.budget.left < 0) throw new PdfTooComplexError('the file needs more work to read than its size allows');
  }

  /** One top-level value (an object's body, a trailer), charged to the budget even if it fails. */
  topValue(): PdfValue {
    const from = this.pos;
    try {
      return this.value();
    } finally {
      this.charge(from);
    }
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
    if (this.pos - start > MAX_WORD) throw new PdfReadError(`a word of more than ${MAX_WORD} bytes at ${start}`);
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
    if (c === -1) throw new PdfReadError('the file ends inside an object');
    if (c === 0x3c /* < */ && this.peek(1) === 0x3c) return this.nested(() => this.dictionary());
    if (c === 0x3c) return this.hexString();
    if (c === 0x28 /* ( */) return this.literalString();
    if (c === 0x2f /* / */) {
      this.pos++;
      return { kind: 'name', value: this.word().replace(/#([0-9a-fA-F]{2})/g, (_, h: string) => String.fromCharCode(parseInt(h, 16))) };
    }
    if (c === 0x5b /* [ */) return this.nested(() => this.array());
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

  private nested(read: () => PdfValue): PdfValue {
    if (this.depth >= MAX_NESTING) throw new PdfReadError(`arrays or dictionaries nested more than ${MAX_NESTING} deep at ${this.pos}`);
    this.depth++;
    try {
      return read();
    } finally {
      this.depth--;
    }
  }

  private array(): PdfValue {
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

  private dictionary(): PdfValue {
    this.pos += 2;
    const entries = new Map<string, PdfValue>();
    for (;;) {
      this.skipWhitespace();
      if (this.peek() === 0x3e && this.peek(1) === 0x3e) {
        this.pos += 2;
        return { kind: 'dict', entries };
      }
      if (this.pos >= this.buf.length) throw new PdfReadError('unterminated dictionary');
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
    // Grown as needed: a number[] of a long string would take eight bytes per byte.
    let out = Buffer.allocUnsafe(64);
    let length = 0;
    const push = (byte: number) => {
      if (length === out.length) out = Buffer.concat([out, Buffer.allocUnsafe(out.length)]);
      out[length++] = byte;
    };
    let depth = 1;
    const escapes: Record<number, number> = { 0x6e: 0x0a, 0x72: 0x0d, 0x74: 0x09, 0x62: 0x08, 0x66: 0x0c };
    while (this.pos < this.buf.length) {
      const c = this.buf[this.pos++]!;
      if (c === 0x5c /* \ */) {
        const e = this.buf[this.pos++]!;
        if (escapes[e] !== undefined) push(escapes[e]);
        else if (e >= 0x30 && e <= 0x37) {
          let oct = e - 0x30;
          for (let i = 0; i < 2 && this.peek() >= 0x30 && this.peek() <= 0x37; i++) oct = oct * 8 + (this.buf[this.pos++]! - 0x30);
          push(oct & 0xff);
        } else if (e === 0x0d) {
          if (this.peek() === 0x0a) this.pos++;
        } else if (e !== 0x0a && e !== undefined) push(e);
      } else if (c === 0x28) {
        depth++;
        push(c);
      } else if (c === 0x29) {
        if (--depth === 0) return { kind: 'string', bytes: Buffer.from(out.subarray(0, length)), start, end: this.pos };
        push(c);
      } else push(c);
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
  budget: WorkBudget;
};

/** The shortest cross-reference entry we accept, "0 0 n" plus a separator (a proper one is 20 bytes). */
const MIN_XREF_ENTRY_BYTES = 6;
/** More objects than this is not a briefing (ours have a few hundred): refused before the table grows. */
const MAX_OBJECTS = 500_000;

function readXrefChain(buf: Buffer, budget: WorkBudget): Pick<PdfDocument, 'offsets' | 'trailer'> {
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
    const p: PdfParser = new PdfParser(buf, at, budget);
    const from = p.pos;
    try {
      p.expectKeyword('xref');
      for (;;) {
        p.skipWhitespace();
        const first = p.word();
        if (first === 'trailer') break;
        p.skipWhitespace();
        const countWord = p.word();
        if (!/^\d{1,10}$/.test(first) || !/^\d{1,10}$/.test(countWord)) throw new PdfReadError('bad xref subsection');
        const count = Number(countWord);
        // The count comes from the file: it may not promise more entries than bytes remain for.
        if (count > (buf.length - p.pos) / MIN_XREF_ENTRY_BYTES) throw new PdfReadError('an xref subsection declares more entries than the file holds');
        for (let i = 0; i < count; i++) {
          p.skipWhitespace();
          const offset = p.word();
          p.skipWhitespace();
          const gen = p.word();
          p.skipWhitespace();
          const type = p.word();
          // Each entry must consume bytes, so the loop cannot outlast the file.
          if (!/^\d+$/.test(offset) || !/^\d+$/.test(gen) || (type !== 'n' && type !== 'f')) throw new PdfReadError('bad xref entry');
          const num = Number(first) + i;
          if (type === 'n' && !offsets.has(num)) offsets.set(num, Number(offset));
          else if (type === 'f' && !offsets.has(num)) offsets.set(num, -1);
          if (offsets.size > MAX_OBJECTS) throw new PdfTooComplexError(`more than ${MAX_OBJECTS} objects`);
        }
      }
    } finally {
      p.charge(from);
    }
    const dict: PdfValue = p.topValue();
    if (dict.kind !== 'dict') throw new PdfReadError('trailer is not a dictionary');
    trailer ??= dict.entries;
    const prev: PdfValue | undefined = dict.entries.get('Prev');
    at = prev?.kind === 'number' ? prev.value : null;
  }
  for (const [k, v] of offsets) if (v < 0) offsets.delete(k);
  return { offsets, trailer: trailer! };
}

function scanObjects(buf: Buffer, budget: WorkBudget): Pick<PdfDocument, 'offsets' | 'trailer'> {
  const text = buf.toString('latin1');
  const offsets = new Map<number, number>();
  for (const m of text.matchAll(/(?:^|[\r\n])(\d{1,10})\s+(\d{1,5})\s+obj\b/g)) {
    offsets.set(Number(m[1]), m.index + (m[0].length - m[0].trimStart().length));
    if (offsets.size > MAX_OBJECTS) throw new PdfTooComplexError(`more than ${MAX_OBJECTS} objects`);
  }
  let last = -1;
  for (const m of text.matchAll(/trailer\s*<</g)) last = m.index;
  let trailer = new Map<string, PdfValue>();
  if (last >= 0) {
    const v = new PdfParser(buf, last + 'trailer'.length, budget).topValue();
    if (v.kind === 'dict') trailer = v.entries;
  }
  return { offsets, trailer };
}

export function openPdf(buf: Buffer): PdfDocument {
  if (buf.subarray(0, 5).toString('latin1') !== '%PDF-') throw new PdfReadError('not a PDF file');
  const budget = workBudgetFor(buf);
  try {
    return { buf, ...readXrefChain(buf, budget), via: 'xref', budget };
  } catch (err) {
    if (err instanceof PdfTooComplexError) throw err;
    return { buf, ...scanObjects(buf, budget), via: 'scan', budget };
  }
}

export function readObject(doc: PdfDocument, num: number): PdfValue | null {
  const offset = doc.offsets.get(num);
  if (offset === undefined) return null;
  if (!Number.isSafeInteger(offset) || offset < 0 || offset >= doc.buf.length) return null;
  const p = new PdfParser(doc.buf, offset, doc.budget);
  const from = p.pos;
  try {
    p.skipWhitespace();
    if (Number(p.word()) !== num) return null;
    p.skipWhitespace();
    p.word();
    p.expectKeyword('obj');
  } finally {
    p.charge(from);
  }
  return p.topValue();
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
