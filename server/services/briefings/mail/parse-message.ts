// A small reader for the messages the fake SMTP server keeps: headers (unfolded, encoded words
// decoded), multipart bodies, base64 and quoted-printable, text and HTML parts, attachments with
// their file names (RFC 2231 continuations included). Enough for the outbox page and the tests,
// which see only what our own mailer writes; not a general mail parser. (The maintained one,
// mailparser, is not installed; this can be swapped for it without changing ParsedMessage.)
import { createHash } from 'node:crypto';

export type MailAttachment = { filename: string | null; contentType: string; size: number; sha256: string; content: Buffer };

export type ParsedMessage = {
  headers: [string, string][];
  subject: string | null;
  from: string | null;
  to: string | null;
  cc: string | null;
  date: string | null;
  messageId: string | null;
  text: string | null;
  html: string | null;
  attachments: MailAttachment[];
};

type Part = { headers: [string, string][]; body: Buffer };

function splitHeaders(raw: Buffer): Part {
  const s = raw.toString('latin1');
  const crlf = s.indexOf('\r\n\r\n');
  const lf = s.indexOf('\n\n');
  const [end, sep] = crlf >= 0 && (lf < 0 || crlf <= lf) ? [crlf, 4] : lf >= 0 ? [lf, 2] : [s.length, 0];
  const unfolded = s.slice(0, end).replace(/\r?\n[ \t]+/g, ' ');
  const headers: [string, string][] = [];
  for (const line of unfolded.split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.push([line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim()]);
  }
  return { headers, body: raw.subarray(Math.min(end + sep, raw.length)) };
}

function header(headers: [string, string][], name: string): string | null {
  return headers.find(([k]) => k === name)?.[1] ?? null;
}

function decodeCharset(bytes: Buffer, charset: string): string {
  try {
    return new TextDecoder(charset.trim().toLowerCase() || 'utf-8').decode(bytes);
  } catch {
    return bytes.toString('latin1');
  }
}

function decodeQuotedPrintable(text: string, underscoreIsSpace: boolean): Buffer {
  const s = (underscoreIsSpace ? text.replace(/_/g, ' ') : text).replace(/=\r?\n/g, '');
  const out: number[] = [];
  for (let i = 0; i < s.length; i++) {
    if (s[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(s.slice(i + 1, i + 3))) {
      out.push(parseInt(s.slice(i + 1, i + 3), 16));
      i += 2;
    } else out.push(s.charCodeAt(i) & 0xff);
  }
  return Buffer.from(out);
}

const ENCODED_WORD = /=\?([^?*]+)(?:\*[^?]*)?\?([BbQq])\?([^?]*)\?=/g;

/**
 * RFC 2047 encoded words. Whitespace between adjacent encoded words is dropped, and their bytes
 * are joined before decoding: a sender may split one multi-byte character across two words.
 */
export function decodeEncodedWords(value: string): string {
  const raw = Buffer.from(value, 'latin1').toString('utf8');
  return raw
    .replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?)/g, '$1')
    .replace(/(?:=\?[^?*]+(?:\*[^?]*)?\?[BbQq]\?[^?]*\?=)+/g, (run) => {
      let text = '';
      let charset: string | null = null;
      let bytes: Buffer[] = [];
      const flush = () => {
        if (charset !== null) text += decodeCharset(Buffer.concat(bytes), charset);
        bytes = [];
      };
      for (const [, cs, enc, body] of run.matchAll(ENCODED_WORD)) {
        if (cs!.toLowerCase() !== charset) {
          flush();
          charset = cs!.toLowerCase();
        }
        bytes.push(enc!.toUpperCase() === 'B' ? Buffer.from(body!, 'base64') : decodeQuotedPrintable(body!, true));
      }
      flush();
      return text;
    });
}

/** `type/subtype; a=b; c="d"` → value and parameters, RFC 2231 `name*0*=` continuations merged. */
export function parseParameters(value: string): { value: string; params: Map<string, string> } {
  const [first, ...rest] = value.match(/(?:[^;"]|"(?:[^"\\]|\\.)*")+/g) ?? [''];
  const pieces = new Map<string, { parts: Map<number, { text: string; extended: boolean }> }>();
  for (const item of rest) {
    const eq = item.indexOf('=');
    if (eq < 0) continue;
    const rawKey = item.slice(0, eq).trim().toLowerCase();
    let text = item.slice(eq + 1).trim();
    if (text.startsWith('"')) text = text.slice(1, -1).replace(/\\(.)/g, '$1');
    const m = /^([^*]+)(?:\*(\d+))?(\*)?$/.exec(rawKey);
    if (!m) continue;
    const key = m[1]!;
    const entry = pieces.get(key) ?? { parts: new Map() };
    entry.parts.set(Number(m[2] ?? 0), { text, extended: m[3] === '*' });
    pieces.set(key, entry);
  }
  const params = new Map<string, string>();
  for (const [key, { parts }] of pieces) {
    const ordered = [...parts.entries()].sort(([a], [b]) => a - b).map(([, p]) => p);
    let charset = 'utf-8';
    const bytes: Buffer[] = [];
    ordered.forEach((p, i) => {
      let text = p.text;
      if (p.extended && i === 0) {
        const q = /^([^']*)'[^']*'(.*)$/.exec(text);
        if (q) {
          charset = q[1] || charset;
          text = q[2]!;
        }
      }
      bytes.push(p.extended ? Buffer.from(text.replace(/%([0-9A-Fa-f]{2})/g, (_, h: string) => String.fromCharCode(parseInt(h, 16))), 'latin1') : Buffer.from(text, 'latin1'));
    });
    const joined = Buffer.concat(bytes);
    params.set(key, ordered.some((p) => p.extended) ? decodeCharset(joined, charset) : decodeEncodedWords(joined.toString('latin1')));
  }
  return { value: (first ?? '').trim().toLowerCase(), params };
}

function decodeBody(body: Buffer, encoding: string | null): Buffer {
  switch ((encoding ?? '7bit').trim().toLowerCase()) {
    case 'base64':
      return Buffer.from(body.toString('latin1').replace(/[^A-Za-z0-9+/=]/g, ''), 'base64');
    case 'quoted-printable':
      return decodeQuotedPrintable(body.toString('latin1'), false);
    default:
      return body;
  }
}

function splitMultipart(body: Buffer, boundary: string): Buffer[] {
  const s = body.toString('latin1');
  const delimiter = `--${boundary}`;
  const parts: Buffer[] = [];
  let at = s.indexOf(delimiter);
  while (at >= 0) {
    const after = at + delimiter.length;
    if (s.startsWith('--', after)) break;
    const start = s.indexOf('\n', after) + 1;
    const next = s.indexOf(`\n${delimiter}`, start);
    if (start <= 0 || next < 0) break;
    const end = next > 0 && s[next - 1] === '\r' ? next - 1 : next;
    parts.push(body.subarray(start, end));
    at = next + 1;
  }
  return parts;
}

function walk(part: Part, out: ParsedMessage, depth: number): void {
  const type = parseParameters(header(part.headers, 'content-type') ?? 'text/plain; charset=us-ascii');
  const disposition = parseParameters(header(part.headers, 'content-disposition') ?? '');
  if (type.value.startsWith('multipart/') && depth < 8) {
    const boundary = type.params.get('boundary');
    if (boundary) for (const child of splitMultipart(part.body, boundary)) walk(splitHeaders(child), out, depth + 1);
    return;
  }
  const content = decodeBody(part.body, header(part.headers, 'content-transfer-encoding'));
  const filename = disposition.params.get('filename') ?? type.params.get('name') ?? null;
  const isAttachment = disposition.value === 'attachment' || filename !== null || !type.value.startsWith('text/');
  if (!isAttachment && type.value === 'text/plain' && out.text === null) out.text = decodeCharset(content, type.params.get('charset') ?? 'us-ascii');
  else if (!isAttachment && type.value === 'text/html' && out.html === null) out.html = decodeCharset(content, type.params.get('charset') ?? 'us-ascii');
  else out.attachments.push({ filename, contentType: type.value, size: content.length, sha256: createHash('sha256').update(content).digest('hex'), content });
}

export function parseMessage(raw: Buffer): ParsedMessage {
  const top = splitHeaders(raw);
  const h = (name: string) => {
    const v = header(top.headers, name);
    return v === null ? null : decodeEncodedWords(v);
  };
  const out: ParsedMessage = {
    headers: top.headers.map(([k, v]) => [k, decodeEncodedWords(v)]),
    subject: h('subject'),
    from: h('from'),
    to: h('to'),
    cc: h('cc'),
    date: h('date'),
    messageId: h('message-id'),
    text: null,
    html: null,
    attachments: [],
  };
  walk(top, out, 0);
  return out;
}
