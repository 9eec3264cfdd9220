// Page 1: what this is, for which plan and scenario, who made it, its status and sign-off,
// the summary in plain words, and a first word of caution.
import type { Content } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { briefingSummary } from '../briefing-summary';
import { formatDate, formatDateTime } from '../../../../shared/format/numbers';
import { COLOURS } from './document-styles';
import { signOffBox, STATUS_WORDS } from './sign-off';

function detailRows(input: BriefingInput): Content {
  const tz = input.timeZone;
  const run = input.run;
  const finished = run.finishedAt ? formatDateTime(new Date(run.finishedAt), tz) : 'not recorded';
  const rows: [string, string][] = [
    ['Plan', input.planName],
    ['Scenario', input.scenarioName ?? 'None — the plan’s own road, zone and shelter data'],
    ['Status', STATUS_WORDS[input.status]],
    ['Prepared by', `${input.preparedBy.name}, ${input.preparedBy.role}`],
    ['Prepared on', formatDateTime(input.createdAt, tz)],
    ['Analysis run', `${run.id} (finished ${finished}), data version ${run.dataVersion}`],
    ['Briefing', `${input.briefingId}, version ${input.version}`],
  ];
  return {
    table: {
      widths: [88, '*'],
      body: rows.map(([k, v]) => [
        { text: k, style: 'th', margin: [0, 1, 0, 0] },
        { text: v, fontSize: 9.5, bold: k === 'Status', color: k === 'Status' && input.status !== 'signed' ? COLOURS.warn : COLOURS.ink },
      ]),
    },
    layout: { hLineWidth: () => 0, vLineWidth: () => 0, paddingLeft: () => 0, paddingRight: () => 6, paddingTop: () => 2.2, paddingBottom: () => 2.2 },
  };
}

export function titlePage(input: BriefingInput): Content[] {
  return [
    { text: input.organizationName.toUpperCase(), style: 'kicker' },
    { canvas: [{ type: 'line', x1: 0, y1: 0, x2: 60, y2: 0, lineWidth: 2, lineColor: COLOURS.accent }], margin: [0, 8, 0, 14] },
    { text: 'Evacuation capacity briefing', style: 'subtitle' },
    { text: input.planName, style: 'title', margin: [0, 4, 0, 4] },
    { text: input.scenarioName ? `Scenario: ${input.scenarioName}` : 'Plan data, no scenario', style: 'subtitle', margin: [0, 0, 0, 2] },
    { text: formatDate(input.createdAt, input.timeZone), fontSize: 10, color: COLOURS.muted, margin: [0, 0, 0, 18] },
    detailRows(input),
    { text: '', margin: [0, 14, 0, 0] },
    signOffBox(input),
    { text: 'In plain words', style: 'h2', margin: [0, 20, 0, 5] },
    { text: briefingSummary(input), style: 'lead' },
    {
      text: [
        { text: 'A planning aid, not an order. ', bold: true },
        'The figures are upper bounds under the assumptions on the following pages. Before acting on them, read “Cautions and limits” at the end of this briefing.',
      ],
      style: 'note',
      color: COLOURS.warn,
      margin: [0, 12, 0, 0],
    },
  ];
}
