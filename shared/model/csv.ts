// CSV that a spreadsheet opens as data: a cell that begins with =, +, -, @ (or a tab or carriage
// return, which some spreadsheets skip before reading a formula) is written with a leading
// apostrophe, so it shows as text and never runs as a formula (OWASP, "CSV Injection"). Numbers
// stay numbers: only text cells are guarded. Comment lines (`# …`) lead the file with the
// caution and the run's identity; readers that take comments (pandas `comment='#'`, GDAL's
// CSV driver does not) skip them, others show them as the first rows.
export type CsvValue = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

/** One cell: guarded against formula execution, quoted when it holds a comma, quote or line break. */
export function csvCell(v: CsvValue): string {
  if (v === null || v === undefined) return '';
  let s = String(v);
  if (typeof v === 'string' && FORMULA_START.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

/** A table with its header row; lines end in CRLF (RFC 4180). */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

/** Leading comment lines, one per text line; line breaks inside a text become separate lines. */
export function csvComments(lines: readonly string[]): string {
  return lines.flatMap((l) => l.split(/\r?\n/)).map((l) => `# ${l}\r\n`).join('');
}
