// fast-check generators of hostile PDFs for the public signature check: files built to make a
// PDF object reader loop for ever, recurse without end, multiply its work, or throw where it
// does not expect to. None of them is a signed briefing, so "not valid" (or a 4xx) is the only
// right answer, and it must come quickly. The shapes follow the PDF file structure of
// ISO 32000-1 §7.5 (header, objects, cross-reference table, trailer, startxref).
import fc from 'fast-check';
import { printable } from './hostile-files';

export type HostilePdf = { kind: string; bytes: Buffer };

const pdf = (kind: string, bytes: Buffer | string): HostilePdf => {
  const buffer = typeof bytes === 'string' ? Buffer.from(bytes, 'latin1') : bytes;
  return printable({ kind, bytes: buffer }, buffer);
};

/**
 * A PDF whose cross-reference table points at the given objects (bodies without "n 0 obj"),
 * numbered from 1, so the reader takes the table and not its fallback scan.
 */
export function pdfWithObjects(bodies: string[], trailer: string): string {
  let out = '%PDF-1.7\n';
  const offsets: number[] = [];
  bodies.forEach((body, i) => {
    offsets.push(out.length);
    out += `${i + 1} 0 obj\n${body}\nendobj\n`;
  });
  const xref = out.length;
  out += `xref\n0 ${bodies.length + 1}\n0000000000 65535 f \n`;
  for (const o of offsets) out += `${String(o).padStart(10, '0')} 00000 n \n`;
  out += `trailer\n${trailer}\nstartxref\n${xref}\n%%EOF\n`;
  return out;
}

/** A table that declares far more entries than the file holds (the count is read from the file). */
const hugeXrefCount = fc
  .record({ count: fc.integer({ min: 100_000, max: 2_000_000_000 }), first: fc.integer({ min: 0, max: 1000 }), entries: fc.integer({ min: 0, max: 3 }) })
  .map(({ count, first, entries }) => {
    const head = '%PDF-1.4\n';
    const rows = '0000000000 65535 f \n'.repeat(entries);
    return pdf('huge xref count', `${head}xref\n${first} ${count}\n${rows}trailer\n<< /Size 1 >>\nstartxref\n${head.length}\n%%EOF\n`);
  });

/** Form fields that list themselves (and each other) as kids: a cycle, repeated. */
const selfKids = fc.integer({ min: 1, max: 64 }).map((n) => {
  // Objects: 1 catalog, 2 AcroForm, 3 Info, then n fields; every field's kids are all fields.
  const fieldRefs = Array.from({ length: n }, (_, i) => `${i + 4} 0 R`).join(' ');
  const fields = Array.from({ length: n }, () => `<< /FT /Sig /T (f) /Kids [${fieldRefs}] >>`);
  return pdf(`${n} fields that are each other's kids`, pdfWithObjects([`<< /Type /Catalog /AcroForm 2 0 R >>`, `<< /Fields [${fieldRefs}] >>`, `<< /Title (x) >>`, ...fields], '<< /Root 1 0 R /Info 3 0 R /Size 99 >>'));
});

/** References that lead back to themselves: Info, Root, the AcroForm and its field array. */
const referenceCycle = fc.constantFrom(
  pdf('Info refers to itself', pdfWithObjects(['1 0 R', '<< /Type /Catalog >>'], '<< /Root 2 0 R /Info 1 0 R >>')),
  pdf('Root and AcroForm refer to each other', pdfWithObjects(['<< /Type /Catalog /AcroForm 2 0 R >>', '<< /Fields 3 0 R /Parent 1 0 R >>', '[3 0 R 1 0 R 2 0 R]'], '<< /Root 1 0 R /Info 1 0 R >>')),
  pdf('each object points at the next, in a ring', pdfWithObjects(['2 0 R', '3 0 R', '4 0 R', '1 0 R'], '<< /Root 1 0 R /Info 2 0 R >>')),
  pdf('Prev points back at its own table', (() => {
    const head = '%PDF-1.4\n';
    return `${head}xref\n0 1\n0000000000 65535 f \ntrailer\n<< /Prev ${head.length} >>\nstartxref\n${head.length}\n%%EOF\n`;
  })()),
);

/** Arrays and dictionaries nested far deeper than any real file, where the reader recurses. */
const deepNesting = fc
  .record({ depth: fc.integer({ min: 1_000, max: 200_000 }), kind: fc.constantFrom('array', 'dict'), where: fc.constantFrom('Info', 'Root', 'trailer') })
  .map(({ depth, kind, where }) => {
    const [open, close] = kind === 'array' ? ['[', ']'] : ['<< /A ', '>>'];
    const deep = open.repeat(depth) + close.repeat(depth);
    if (where === 'trailer') return pdf(`${kind} nested ${depth} deep in the trailer`, `%PDF-1.4\ntrailer\n<< /Info ${deep} >>\n%%EOF\n`);
    return pdf(`${kind} nested ${depth} deep in ${where}`, pdfWithObjects([deep, '<< /Type /Catalog >>'], where === 'Info' ? '<< /Info 1 0 R /Root 2 0 R >>' : '<< /Root 1 0 R >>'));
  });

/** Wide trees: one field with many kids, each with many kids, all distinct objects. */
const wideTree = fc.record({ fanout: fc.integer({ min: 10, max: 120 }) }).map(({ fanout }) => {
  // 1 catalog, 2 AcroForm, then fanout middle fields, then fanout² leaves.
  const middle = Array.from({ length: fanout }, (_, i) => {
    const leaves = Array.from({ length: fanout }, (_, j) => `${3 + fanout + i * fanout + j} 0 R`).join(' ');
    return `<< /T (m) /Kids [${leaves}] >>`;
  });
  const leaves = Array.from({ length: fanout * fanout }, () => '<< /FT /Sig /T (l) /V << /ByteRange [0 1 2 3] >> >>');
  const middleRefs = Array.from({ length: fanout }, (_, i) => `${3 + i} 0 R`).join(' ');
  return pdf(`a form tree ${fanout} wide at each level`, pdfWithObjects(['<< /Type /Catalog /AcroForm 2 0 R >>', `<< /Fields [${middleRefs}] >>`, ...middle, ...leaves], '<< /Root 1 0 R >>'));
});

/**
 * Objects inside objects: each object header sits inside the previous object's string, so
 * reading every object from its own offset reads the rest of the file again (quadratic work).
 */
const overlappingObjects = fc.integer({ min: 2_000, max: 40_000 }).map((k) => {
  let out = '%PDF-1.4\n';
  const offsets: number[] = [];
  for (let i = 1; i <= k; i++) {
    offsets.push(out.length);
    out += `${i} 0 obj (`;
  }
  out += ')'.repeat(k) + '\n';
  const xref = out.length;
  out += `xref\n0 ${k + 1}\n0000000000 65535 f \n`;
  for (const o of offsets) out += `${String(o).padStart(10, '0')} 00000 n \n`;
  out += `trailer\n<< /Size ${k + 1} >>\nstartxref\n${xref}\n%%EOF\n`;
  return pdf(`${k} objects nested inside each other's strings`, out);
});

/** Info and AcroForm objects that are not what they should be. */
const malformedInfoOrForm = fc.constantFrom(
  ...[
    ['Info unterminated', '<< /Title (never closed'],
    ['Info is a bad hex string', '<< /CutlineBriefingId <zz> >>'],
    ['Info is a number', '42'],
    ['Info starts with a stray delimiter', ') >> ]'],
    ['Info value is a dictionary with a non-name key', '<< (key) (value) >>'],
    ['Info ends the file', '<<'],
  ].map(([kind, body]) => pdf(kind!, pdfWithObjects([body!, '<< /Type /Catalog /AcroForm 3 0 R >>', body!], '<< /Info 1 0 R /Root 2 0 R >>'))),
  pdf('Info names an object that is not there', pdfWithObjects(['<< /Type /Catalog >>'], '<< /Info 99 0 R /Root 1 0 R >>')),
  pdf('AcroForm Fields is a string', pdfWithObjects(['<< /Type /Catalog /AcroForm << /Fields (x) >> >>'], '<< /Root 1 0 R >>')),
  pdf('xref entry offsets beyond the file', `%PDF-1.4\nxref\n0 2\n0000000000 65535 f \n9999999999 00000 n \ntrailer\n<< /Root 1 0 R /Info 1 0 R >>\nstartxref\n9\n%%EOF\n`),
);

/** One very long token where the reader expects a short one (names, numbers, keywords). */
const longToken = fc
  .record({ n: fc.integer({ min: 100_000, max: 3_000_000 }), ch: fc.constantFrom('1', 'a', '#', ' ', '%', '(') })
  .map(({ n, ch }) => pdf(`${n} × "${ch}"`, pdfWithObjects([`<< /Title ${ch === '#' ? '/' : ''}${ch.repeat(n)}x >>`, '<< /Type /Catalog >>'], '<< /Info 1 0 R /Root 2 0 R >>')));

/** Bytes that look like the start of a PDF and then stop. */
const truncatedHead = fc.uint8Array({ minLength: 0, maxLength: 512 }).map((b) => pdf('a header and noise', Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.from(b)])));

export const hostilePdfs: fc.Arbitrary<HostilePdf>[] = [hugeXrefCount, selfKids, referenceCycle, deepNesting, wideTree, overlappingObjects, malformedInfoOrForm, longToken, truncatedHead];

/** A real signed briefing cut short, or with bytes overwritten: damaged copies of the genuine article. */
export function damagedCopies(signed: Buffer): fc.Arbitrary<HostilePdf> {
  const truncated = fc.integer({ min: 1, max: signed.length - 1 }).map((at) => pdf(`signed briefing cut at ${at}`, signed.subarray(0, at)));
  const overwritten = fc
    .array(fc.record({ at: fc.integer({ min: 0, max: signed.length - 1 }), byte: fc.integer({ min: 0, max: 255 }) }), { minLength: 1, maxLength: 8 })
    .map((edits) => {
      const copy = Buffer.from(signed);
      for (const { at, byte } of edits) copy[at] = byte === copy[at] ? byte ^ 1 : byte;
      return pdf(`signed briefing with ${edits.length} bytes overwritten`, copy);
    });
  // Streams cut out of the middle: the xref offsets then point at the wrong places.
  const streamCut = fc.integer({ min: 0, max: 20 }).map((i) => {
    const text = signed.toString('latin1');
    let from = -1;
    for (let j = 0; j <= i; j++) from = text.indexOf('stream\n', from + 1);
    if (from < 0) from = text.indexOf('stream\n');
    const to = text.indexOf('endstream', from);
    return pdf(`signed briefing with stream ${i} cut out`, Buffer.concat([signed.subarray(0, from + 7), signed.subarray(to)]));
  });
  return fc.oneof(truncated, overwritten, streamCut);
}
