// The sign-off box on the title page. For a signed briefing it names the official, their role
// and the signing time: these are rendered into the page before the digital signature is
// applied, so they are part of what the signature covers.
import type { Content } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { formatDateTime } from '../../../../shared/format/numbers';
import { COLOURS } from './document-styles';

export const STATUS_WORDS: Record<BriefingInput['status'], string> = {
  draft: 'Draft — not signed',
  'awaiting-sign-off': 'Awaiting sign-off — not signed',
  signed: 'Signed',
  returned: 'Returned for changes — not signed',
};

function box(fill: string, border: string, stack: Content[]): Content {
  return {
    table: { widths: ['*'], body: [[{ stack, fillColor: fill, margin: [10, 8, 10, 8] }]] },
    layout: { hLineWidth: () => 0.8, vLineWidth: () => 0.8, hLineColor: () => border, vLineColor: () => border, paddingLeft: () => 0, paddingRight: () => 0, paddingTop: () => 0, paddingBottom: () => 0 },
  };
}

export function signOffBox(input: BriefingInput): Content {
  const tz = input.timeZone;
  if (input.status === 'signed') {
    const s = input.signature;
    if (!s) throw new Error('a signed briefing needs the signer');
    return box('#f1f8f3', '#8fc79d', [
      { text: 'SIGNED OFF', style: 'figureLabel', color: COLOURS.ok },
      { text: [{ text: s.name, bold: true }, `, ${s.role}`], fontSize: 11, margin: [0, 3, 0, 1] },
      { text: `Signed on ${formatDateTime(s.signedAt, tz)} for ${input.organizationName}.`, fontSize: 9 },
      {
        text:
          `This file carries a digital signature made with ${input.organizationName}'s signing certificate. ` +
          (input.verificationUrl ? `To check that a copy is unaltered, upload it at ${input.verificationUrl}.` : 'Any change to the file after signing makes the signature invalid.'),
        style: 'note',
        margin: [0, 4, 0, 0],
      },
    ]);
  }
  if (input.status === 'returned' && input.returned) {
    const r = input.returned;
    return box('#fff4f6', '#e6a3b6', [
      { text: 'RETURNED FOR CHANGES — NOT SIGNED', style: 'figureLabel', color: COLOURS.warn },
      { text: [{ text: r.name, bold: true }, `, ${r.role}, on ${formatDateTime(r.returnedAt, tz)}:`], fontSize: 9.5, margin: [0, 3, 0, 2] },
      { text: `“${r.comment}”`, italics: true, fontSize: 9.5 },
      { text: 'Not for distribution.', style: 'note', margin: [0, 4, 0, 0] },
    ]);
  }
  const line = input.status === 'awaiting-sign-off' ? 'AWAITING SIGN-OFF — NOT SIGNED' : 'DRAFT — NOT SIGNED';
  return box(COLOURS.band, COLOURS.rule, [
    { text: line, style: 'figureLabel', color: COLOURS.warn },
    { text: 'Signed by: ______________________________   Role: ____________________   Date: ______________', fontSize: 9, color: COLOURS.muted, margin: [0, 8, 0, 2] },
    { text: 'Not for distribution until signed off in Cutline; the signed copy carries a digital signature.', style: 'note', margin: [0, 4, 0, 0] },
  ]);
}
