// fast-check generators of malformed upload requests (the multipart form around the file):
// the file in the wrong field or missing, too many parts, bad import options, and bodies that
// are not multipart at all. Each is wrong whatever the file holds.
import fc from 'fast-check';
import { badFeature, printable, toJsonText, validDocument, type UploadTarget } from './hostile-files';

export type FormPart = { field: string; bytes: Buffer; fileName: string };
export type HostileForm =
  | { kind: string; files: FormPart[]; fields: [string, string][] }
  | { kind: string; contentType: string; body: Buffer };

const validFile = (target: UploadTarget) => validDocument(target).map((doc) => Buffer.from(toJsonText(doc)));
const malformedFile = (target: UploadTarget) => badFeature[target].map((f) => Buffer.from(toJsonText({ type: 'FeatureCollection', features: [f] })));
const part = (field: string, bytes: Buffer, fileName = 'upload.geojson'): FormPart => ({ field, bytes, fileName });

/** Import options that the schema refuses (`null` would mean "defaults", so it is not here). */
const badOptions = fc.oneof(
  fc.constantFrom('{', 'yes', "{'snapToleranceMeters': 3}", '{"snapToleranceMeters": NaN}', '[]', '"defaults"', '5', 'true'),
  fc
    .constantFrom(
      { snapToleranceMeters: '3' },
      { snapToleranceMeters: -1 },
      { snapToleranceMeters: 51 },
      { tinySegmentMeters: 101 },
      { splitAtCrossings: 'yes' },
      { propertyMapping: {} },
      { propertyMapping: { roadClass: '' } },
      { propertyMapping: { roadClass: 'kind', classValues: { a: 'footpath' } } },
      { propertyMapping: { roadClass: 'kind', speedUnit: 'furlongs' } },
      { propertyMapping: 'osm' },
    )
    .map((o) => JSON.stringify(o)),
  fc.constant('{"snapToleranceMeters": 1e999}'),
);

export function hostileForms(target: UploadTarget): fc.Arbitrary<HostileForm> {
  const boundary = '----cutline-hostile-form';
  const rawForms = fc.constantFrom(
    { kind: 'multipart without a boundary', contentType: 'multipart/form-data', body: Buffer.from('--x\r\nContent-Disposition: form-data; name="file"; filename="a.geojson"\r\n\r\n{}\r\n--x--\r\n') },
    { kind: 'multipart cut short', contentType: `multipart/form-data; boundary=${boundary}`, body: Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="a.geojson"\r\n\r\n{"type":"Feature`) },
    { kind: 'multipart with another boundary', contentType: `multipart/form-data; boundary=${boundary}`, body: Buffer.from('--other\r\nContent-Disposition: form-data; name="file"; filename="a.geojson"\r\n\r\n{}\r\n--other--\r\n') },
    { kind: 'multipart part without headers', contentType: `multipart/form-data; boundary=${boundary}`, body: Buffer.from(`--${boundary}\r\n\r\n{}\r\n--${boundary}--\r\n`) },
    { kind: 'the file as a JSON body', contentType: 'application/json', body: Buffer.from('{"type":"FeatureCollection","features":[]}') },
    { kind: 'the file as the raw body', contentType: 'application/geo+json', body: Buffer.from('{"type":"FeatureCollection","features":[]}') },
    { kind: 'a urlencoded form', contentType: 'application/x-www-form-urlencoded', body: Buffer.from('file=%7B%7D') },
  );
  const forms: fc.Arbitrary<HostileForm>[] = [
    rawForms,
    fc.tuple(validFile(target), fc.constantFrom('upload', 'files', 'file[]', 'File', 'data')).map(([bytes, field]) => ({ kind: `file in field "${field}"`, files: [part(field, bytes)], fields: [] })),
    fc.constant({ kind: 'no file', files: [], fields: [['name', 'Roads without a file']] }),
    fc.tuple(validFile(target), validFile(target)).map(([a, b]) => ({ kind: 'two files', files: [part('file', a), part('file', b, 'second.geojson')], fields: [] })),
    validFile(target).map((bytes) => ({ kind: 'too many fields', files: [part('file', bytes)], fields: Array.from({ length: 11 }, (_, i) => [`note${i}`, 'x'] as [string, string]) })),
    validFile(target).map((bytes) => ({ kind: 'a field value over 1 MB', files: [part('file', bytes)], fields: [['name', 'x'.repeat(1024 * 1024 + 1)]] })),
    fc.tuple(malformedFile(target), fc.constantFrom('__proto__', 'constructor[prototype][polluted]', '__proto__[polluted]', 'name[__proto__][polluted]')).map(([bytes, field]) => ({
      kind: `a malformed file with a field named ${field}`,
      files: [part('file', bytes)],
      fields: [[field, 'yes']],
    })),
    fc.tuple(malformedFile(target), fc.constantFrom('../../etc/passwd', 'C:\\Windows\\win.ini', 'a'.repeat(255), 'zones\u202egnp.exe', '.geojson', 'roads.geojson\u0000.png')).map(([bytes, fileName]) => ({
      kind: 'a malformed file with an odd name',
      files: [part('file', bytes, fileName)],
      fields: [],
    })),
  ];
  // A valid file, but NUL in what is stored beside it (the layer's name, the source file name).
  forms.push(
    validFile(target).map((bytes) => ({ kind: 'a NUL in the name field', files: [part('file', bytes)], fields: [['name', 'Quay\u0000Roads']] })),
    validFile(target).map((bytes) => ({ kind: 'a NUL in the file name', files: [part('file', bytes, 'roads\u0000.geojson')], fields: [] })),
  );
  if (target === 'roads') {
    forms.push(
      fc.tuple(validFile(target), badOptions).map(([bytes, options]) => ({ kind: 'bad import options', files: [part('file', bytes)], fields: [['options', options]] })),
      validFile(target).map((bytes) => ({ kind: 'options twice', files: [part('file', bytes)], fields: [['options', '{}'], ['options', '{}']] })),
      validFile(target).map((bytes) => ({ kind: 'options in brackets', files: [part('file', bytes)], fields: [['options[snapToleranceMeters]', '3']] })),
    );
  }
  return fc.oneof(...forms).map((f) => printable(f, 'files' in f ? (f.files[0]?.bytes ?? Buffer.alloc(0)) : f.body));
}
