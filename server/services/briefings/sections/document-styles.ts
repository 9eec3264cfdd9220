// Typography and table rules of the briefing: one sans-serif (Roboto, shipped with pdfmake),
// a small set of sizes, thin rules, numbers right-aligned.
import type { ContentTable, CustomTableLayout, StyleDictionary, TableCell } from 'pdfmake/interfaces';

export const COLOURS = {
  ink: '#1f2328',
  muted: '#5c6670',
  rule: '#d0d5da',
  accent: '#1864ab',
  band: '#f3f5f7',
  warn: '#a61e4d',
  ok: '#2b8a3e',
};

export const styles: StyleDictionary = {
  kicker: { fontSize: 9, color: COLOURS.muted, characterSpacing: 0.6 },
  title: { fontSize: 24, bold: true, color: COLOURS.ink, lineHeight: 1.1 },
  subtitle: { fontSize: 13, color: COLOURS.muted },
  h1: { fontSize: 15, bold: true, color: COLOURS.ink, margin: [0, 0, 0, 6] },
  h2: { fontSize: 11, bold: true, color: COLOURS.ink, margin: [0, 10, 0, 4] },
  lead: { fontSize: 10.5, lineHeight: 1.35 },
  note: { fontSize: 8, color: COLOURS.muted, lineHeight: 1.3 },
  caption: { fontSize: 8, color: COLOURS.muted, italics: true, margin: [0, 3, 0, 0] },
  th: { fontSize: 8, bold: true, color: COLOURS.muted },
  td: { fontSize: 8.5 },
  figureValue: { fontSize: 17, bold: true, color: COLOURS.ink },
  figureLabel: { fontSize: 8, bold: true, color: COLOURS.muted, characterSpacing: 0.3 },
  figureNote: { fontSize: 7.5, color: COLOURS.muted, lineHeight: 1.25 },
};

/** Horizontal rules only: a firm one under the header, hairlines between rows. */
export const tableLayout: CustomTableLayout = {
  hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0 : i === (node.table.headerRows ?? 0) ? 0.9 : 0.35),
  vLineWidth: () => 0,
  hLineColor: (i, node) => (i === (node.table.headerRows ?? 0) ? COLOURS.muted : COLOURS.rule),
  paddingLeft: (i) => (i === 0 ? 0 : 5),
  paddingRight: (i, node) => (i === (node.table.widths?.length ?? 0) - 1 ? 0 : 5),
  paddingTop: () => 3.2,
  paddingBottom: () => 3.2,
};

export function th(text: string, alignment: 'left' | 'right' = 'left'): TableCell {
  return { text, style: 'th', alignment };
}

export function td(text: string, options: { right?: boolean; bold?: boolean; color?: string; noWrap?: boolean } = {}): TableCell {
  return { text, style: 'td', alignment: options.right ? 'right' : 'left', bold: options.bold ?? false, color: options.color ?? COLOURS.ink, noWrap: options.noWrap ?? false };
}

/** A table with a repeated header row and the briefing's rules. */
export function dataTable(widths: (number | string)[], header: TableCell[], rows: TableCell[][], keepTogether = false): ContentTable {
  return {
    table: { headerRows: 1, widths, body: [header, ...rows], dontBreakRows: true, keepWithHeaderRows: keepTogether ? rows.length : 1 },
    layout: tableLayout,
  };
}
