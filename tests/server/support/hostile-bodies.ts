// fast-check generators of hostile JSON request bodies, built around one valid sample body of
// a route: anything at all, each field of the wrong type or missing, huge strings, deep nesting,
// prototype-pollution keys, NaN-ish numbers, extra keys, arrays for objects, JSON text that is
// not JSON, and bodies sent as something other than JSON. Each body says what the client meant
// (`intended`), so a test can tell a malformed body from one that happens to be valid.
import fc from 'fast-check';
import { printable, raw, toJsonText } from './hostile-files';

/** The body cannot be read as JSON at all (bad text, wrong content type or encoding). */
export const UNREADABLE = Symbol('unreadable');

export type HostileBody = {
  kind: string;
  contentType: string;
  contentEncoding?: string;
  text: string;
  intended: unknown;
};

type Sample = Record<string, unknown>;
type Path = (string | number)[];

function tryParse(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return UNREADABLE;
  }
}

function body(kind: string, text: string, contentType = 'application/json', intended: unknown = tryParse(text), contentEncoding?: string): HostileBody {
  return printable({ kind, contentType, text, intended, ...(contentEncoding ? { contentEncoding } : {}) }, Buffer.from(text));
}

/** Every path into the sample down to three levels, arrays by their first element. */
export function pathsOf(value: unknown, prefix: Path = [], depth = 3): Path[] {
  if (depth === 0 || value === null || typeof value !== 'object') return [];
  const entries: [string | number, unknown][] = Array.isArray(value) ? (value.length > 0 ? [[0, value[0]]] : []) : Object.entries(value);
  return entries.flatMap(([k, v]) => [[...prefix, k], ...pathsOf(v, [...prefix, k], depth - 1)]);
}

function setAt(sample: Sample, path: Path, value: unknown, remove = false): unknown {
  const copy = structuredClone(sample) as Record<string | number, unknown>;
  let at: Record<string | number, unknown> = copy;
  for (const key of path.slice(0, -1)) at = at[key] as Record<string | number, unknown>;
  const last = path[path.length - 1]!;
  if (remove && Array.isArray(at)) at.splice(Number(last), 1);
  else if (remove) delete at[last];
  else at[last] = value;
  return copy;
}

const describePath = (path: Path) => path.join('.') || '(body)';

/** Values a field should never hold: other types, empty and absurd ones, objects that coerce badly. */
export const wrongValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.jsonValue({ maxDepth: 2 }),
  fc.constantFrom(null, true, false, 0, -1, 1.5, -0.000001, 1e308, -1e308, '', ' ', 'x', 'NaN', 'null', 'true', '0x10', '1e999', '-', [], [null], {}, { value: 1 }),
  fc.constantFrom({ toString: 1 }, { valueOf: 'x' }, { toString: 'a', valueOf: 'b' }, [{ toString: 1 }], { toJSON: 1 }, { length: 1e9 }, { then: 'not a promise' }),
  fc.constantFrom('00000000-0000-0000-0000-000000000000x', 'not-a-uuid', '../../etc/passwd', '<script>alert(1)</script>', "'; DROP TABLE plans; --", '\u202eevil', 'a\u0000b'),
);

const nanish = fc.constantFrom('NaN', 'Infinity', '-Infinity', '1e999', '0x10', ' 12 ', '', '12abc', '1,5', '∞', '½');
const rawNumber = fc.constantFrom('NaN', 'Infinity', '-Infinity', '1e999', '-1e999', '01', '+1', '.5', '0x10', '1e');

const nested = (depth: number, inner: string, open = '[', close = ']') => `${open.repeat(depth)}${inner}${close.repeat(depth)}`;
const deepValue = fc.constantFrom(100, 1_000, 10_000, 100_000).chain((depth) =>
  fc.constantFrom(raw(nested(depth, '1')), raw(nested(depth, '1', '{"a":', '}')), raw(nested(depth, '"x"'))),
);

const pollution = fc.constantFrom(
  '"__proto__":{"polluted":"yes","role":"admin","isAdmin":true}',
  '"constructor":{"prototype":{"polluted":"yes"}}',
  '"__proto__":{"toString":"broken"}',
  '"__proto__":null',
  '"hasOwnProperty":"no","toString":1,"valueOf":{}',
);

const contentTypes = fc.constantFrom(
  'text/plain',
  'application/x-www-form-urlencoded',
  'application/xml',
  'multipart/form-data; boundary=hostile',
  'application/geo+json',
  'application/json; charset=latin1',
  'application/json; charset=utf-16',
  'application/octet-stream',
);

/** Hostile bodies for a route whose valid body looks like `sample`. */
export function hostileBodies(sample: Sample): fc.Arbitrary<HostileBody> {
  const paths = pathsOf(sample);
  const numeric = paths.filter((p) => typeof p.reduce<unknown>((v, k) => (v as Record<string | number, unknown>)[k], sample) === 'number');
  const path = paths.length > 0 ? fc.constantFrom(...paths) : fc.constant<Path>(['field']);
  const valid = JSON.stringify(sample);

  const classes: fc.Arbitrary<HostileBody>[] = [
    fc.jsonValue().map((v) => body('any JSON value', JSON.stringify(v) ?? 'null')),
    fc.tuple(path, wrongValue).map(([p, v]) => body(`wrong type at ${describePath(p)}`, toJsonText(setAt(sample, p, v)))),
    path.map((p) => body(`missing ${describePath(p)}`, JSON.stringify(setAt(sample, p, undefined, true)))),
    fc.tuple(path, fc.constantFrom(201, 2_001, 100_000, 900_000)).map(([p, n]) => body(`a ${n}-character string at ${describePath(p)}`, toJsonText(setAt(sample, p, 'x'.repeat(n))))),
    // Over the server's 1 MB JSON limit, it cannot be read whatever it says.
    fc.integer({ min: 1024 * 1024, max: 1024 * 1024 + 4096 }).map((n) => body('a body over 1 MB', toJsonText({ ...sample, padding: 'x'.repeat(n) }), 'application/json', UNREADABLE)),
    fc.tuple(path, deepValue).map(([p, v]) => body(`deep nesting at ${describePath(p)}`, toJsonText(setAt(sample, p, v)))),
    fc.constantFrom(1_000, 100_000).map((depth) => body(`a body nested ${depth} deep`, nested(depth, valid))),
    fc.tuple(path, wrongValue, pollution).map(([p, v, keys]) => body(`prototype keys, wrong ${describePath(p)}`, toJsonText(setAt(sample, p, v)).replace(/^\{/, `{${keys},`))),
    fc.tuple(pollution, path, wrongValue).map(([keys, p, v]) => {
      // Pollution keys inside a nested object of the body too.
      const text = toJsonText(setAt(sample, p, v));
      return body('prototype keys in a nested object', text.replace(/:\{/, `:{${keys},`));
    }),
    numeric.length > 0
      ? fc.tuple(fc.constantFrom(...numeric), fc.oneof(nanish, rawNumber.map(raw))).map(([p, v]) => body(`NaN-ish ${describePath(p)}`, toJsonText(setAt(sample, p, v))))
      : fc.tuple(path, rawNumber.map(raw)).map(([p, v]) => body(`NaN-ish ${describePath(p)}`, toJsonText(setAt(sample, p, v)))),
    fc.tuple(path, wrongValue, fc.dictionary(fc.string({ minLength: 1, maxLength: 12 }), fc.jsonValue({ maxDepth: 1 }), { minKeys: 1, maxKeys: 5 })).map(([p, v, extra]) =>
      body(`extra keys, wrong ${describePath(p)}`, toJsonText({ ...extra, ...(setAt(sample, p, v) as Sample) })),
    ),
    fc.constantFrom(`[${valid}]`, '[]', `[[${valid}]]`, `[${valid},${valid}]`).map((t) => body('an array for the object', t)),
    path.map((p) => body(`an array at ${describePath(p)}`, toJsonText(setAt(sample, p, [p.reduce<unknown>((v, k) => (v as Record<string | number, unknown>)[k], sample)])))),
    fc.integer({ min: 1, max: Math.max(1, valid.length - 1) }).map((n) => body('JSON cut short', valid.slice(0, n))),
    fc
      .constantFrom(
        valid.replace(/}$/, ',}'),
        valid.replace(/"/g, "'"),
        valid.replace(/"([^"]+)":/g, '$1:'),
        `// a comment\n${valid}`,
        `${valid}${valid}`,
        `${valid} trailing`,
        `\ufeff${valid.slice(0, -1)}`,
        '{',
        '}',
        'undefined',
        '{"a":1,}',
      )
      .map((t) => body('JSON text that is not JSON', t)),
    // The same key twice: JSON.parse keeps the last, here a wrong one.
    fc.tuple(path.filter((p) => p.length === 1), wrongValue).map(([p, v]) => body(`${describePath(p)} twice`, valid.replace(/}$/, `,${JSON.stringify(String(p[0]))}:${toJsonText(v)}}`))),
    fc.tuple(contentTypes, fc.boolean(), path, wrongValue).map(([type, asValid, p, v]) =>
      body(`sent as ${type}`, asValid ? valid : toJsonText(setAt(sample, p, v)), type, UNREADABLE),
    ),
    fc.constantFrom('gzip', 'deflate', 'br', 'compress', 'x-unknown').map((encoding) => body(`claims ${encoding} encoding`, valid, 'application/json', UNREADABLE, encoding)),
  ];
  return fc.oneof(...classes);
}
