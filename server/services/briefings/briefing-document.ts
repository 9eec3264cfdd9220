// The briefing as a pdfmake document definition: a pure function of BriefingInput.
// render-pdf.ts turns it into bytes; signing/sign-pdf.ts signs those bytes.
//
// Identification travels in two places: the footer of every page (briefing id, version, content
// SHA-256, see content-fingerprint.ts) and the PDF's document information dictionary
// (Cutline* keys below), which signing/verify-pdf.ts reads back from an uploaded file.
import type { Content, TDocumentDefinitions, TDocumentInformation } from 'pdfmake/interfaces';
import type { BriefingInput } from './briefing-input';
import { contentSha256 } from './content-fingerprint';
import { assumptionsSection } from './sections/assumptions';
import { cautionsSection } from './sections/cautions';
import { COLOURS, styles } from './sections/document-styles';
import { headlineFigures } from './sections/headline-figures';
import { arrivalLimitsTable, chokePointTable, fixRanking, mapFigure } from './sections/limiting-roads';
import { STATUS_WORDS } from './sections/sign-off';
import { titlePage } from './sections/title-page';
import { shelterTable, zoneTable } from './sections/zones-and-shelters';
import { searchesSection } from './sections/searches';

/** Keys of the PDF information dictionary that identify a Cutline briefing. */
export const INFO_KEYS = {
  briefingId: 'CutlineBriefingId',
  version: 'CutlineBriefingVersion',
  contentSha256: 'CutlineContentSha256',
  status: 'CutlineStatus',
  organization: 'CutlineOrganization',
  signerName: 'CutlineSignerName',
  signerRole: 'CutlineSignerRole',
  signedAt: 'CutlineSignedAt',
} as const;

function checkInput(input: BriefingInput): void {
  if (input.status === 'signed' && !input.signature) throw new Error('a signed briefing needs signature (name, role, time)');
  if (input.status !== 'signed' && input.signature) throw new Error(`a ${input.status} briefing cannot carry a signature`);
  if (input.result.headline.horizonMinutes !== input.run.parameters.horizonMinutes) {
    throw new Error('the result and the run disagree on the horizon');
  }
}

function documentInformation(input: BriefingInput, hash: string): TDocumentInformation {
  const scenario = input.scenarioName ? ` — ${input.scenarioName}` : '';
  const info: Record<string, string | Date> = {
    title: `Evacuation capacity briefing: ${input.planName}${scenario}`,
    author: input.organizationName,
    subject: `Briefing ${input.briefingId}, version ${input.version}, from analysis run ${input.run.id}`,
    keywords: `cutline-briefing, briefing-id:${input.briefingId}, content-sha256:${hash}`,
    creator: 'Cutline',
    producer: 'Cutline (pdfmake)',
    creationDate: input.signature?.signedAt ?? input.createdAt,
    [INFO_KEYS.briefingId]: input.briefingId,
    [INFO_KEYS.version]: String(input.version),
    [INFO_KEYS.contentSha256]: hash,
    [INFO_KEYS.status]: input.status,
    [INFO_KEYS.organization]: input.organizationName,
  };
  if (input.signature) {
    info[INFO_KEYS.signerName] = input.signature.name;
    info[INFO_KEYS.signerRole] = input.signature.role;
    info[INFO_KEYS.signedAt] = input.signature.signedAt.toISOString();
  }
  // pdfmake passes custom keys through to the PDF; its type lists only the standard ones.
  return info as TDocumentInformation;
}

function pageBreak(content: Content[]): Content[] {
  const [first, ...rest] = content;
  return first === undefined ? [] : [{ stack: [first], pageBreak: 'before' }, ...rest];
}

export function buildBriefingDocument(input: BriefingInput): TDocumentDefinitions {
  checkInput(input);
  const hash = contentSha256(input);
  const scenario = input.scenarioName ?? 'plan data, no scenario';
  const margin = 48;
  return {
    pageSize: input.pageSize ?? 'LETTER',
    pageMargins: [margin, 52, margin, 58],
    info: documentInformation(input, hash),
    defaultStyle: { font: 'Roboto', fontSize: 9, color: COLOURS.ink, lineHeight: 1.2 },
    styles,
    // The status stands in the header of every page after the first (no watermark: its letters
    // get mixed into the text that readers copy or search).
    header: (currentPage) =>
      currentPage === 1
        ? null
        : {
            columns: [
              { text: `${input.planName} · ${scenario}`, color: COLOURS.muted, fontSize: 7.5 },
              input.signature
                ? { text: `Signed by ${input.signature.name}`, alignment: 'right', color: COLOURS.ok, fontSize: 7.5, bold: true }
                : { text: STATUS_WORDS[input.status], alignment: 'right', color: COLOURS.warn, fontSize: 7.5, bold: true },
            ],
            margin: [margin, 24, margin, 0],
          },
    footer: (currentPage, pageCount, pageSize) => ({
      stack: [
        { canvas: [{ type: 'line', x1: 0, y1: 0, x2: pageSize.width - 2 * margin, y2: 0, lineWidth: 0.4, lineColor: COLOURS.rule }] },
        {
          columns: [
            { text: `Briefing ${input.briefingId} · version ${input.version} · ${input.organizationName}`, fontSize: 7, color: COLOURS.muted },
            { text: `Page ${currentPage} of ${pageCount}`, alignment: 'right', fontSize: 7.5, color: COLOURS.ink, width: 70 },
          ],
          margin: [0, 5, 0, 0],
        },
        { text: `Content SHA-256 ${hash}`, fontSize: 6.5, color: COLOURS.muted, margin: [0, 2, 0, 0] },
      ],
      margin: [margin, 10, margin, 0],
    }),
    // A heading never ends a page: it moves on with what it introduces.
    pageBreakBefore: (node, queries) => {
      const style = Array.isArray(node.style) ? node.style : [node.style];
      if (!style.includes('h1') && !style.includes('h2')) return false;
      return node.startPosition.verticalRatio > 0.82 || queries.getFollowingNodesOnPage().length === 0;
    },
    content: [
      ...titlePage(input),
      ...pageBreak(headlineFigures(input)),
      ...pageBreak([...mapFigure(input), ...chokePointTable(input), ...arrivalLimitsTable(input), ...fixRanking(input)]),
      ...zoneTable(input),
      ...shelterTable(input),
      ...pageBreak(searchesSection(input)),
      ...pageBreak(assumptionsSection(input)),
      ...pageBreak(cautionsSection()),
    ],
  };
}
