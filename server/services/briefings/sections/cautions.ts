// The cautions every briefing carries, in Cutline's own words (the points of docs/model.md §4).
import type { Content } from 'pdfmake/interfaces';
import { COLOURS } from './document-styles';

export const CAUTIONS: { lead: string; text: string }[] = [
  {
    lead: 'A planning aid, not an order.',
    text: 'This briefing supports planning. It is not an evacuation order, a timetable or an instruction to the public, and it does not replace the judgement of those in charge on the day.',
  },
  {
    lead: 'Upper bounds under stated assumptions.',
    text: 'Evacuees per hour and the times shown are the best the road network allows under the assumptions on the previous pages. Traffic in real evacuations has run well below handbook lane capacities, so expect slower clearance than shown.',
  },
  {
    lead: 'The figures move with their inputs.',
    text: 'Results depend on how many residents leave and when, how many vehicles each household takes, shelter intake and the capacity values used. A change in any of them changes the figures; compare scenarios rather than relying on one number.',
  },
  {
    lead: 'Check against local knowledge.',
    text: 'Validate the network, the capacities and the results against local traffic counts, incident records and the experience of those who operate the roads.',
  },
  {
    lead: 'Other rules come first.',
    text: 'Defer to the jurisdiction’s emergency operations plan and to local emergency management codes. Any change to roads, lanes, signals or traffic control, including contraflow, needs review and approval by a licensed traffic engineer.',
  },
];

export function cautionsSection(): Content[] {
  return [
    { text: 'Cautions and limits', style: 'h1', color: COLOURS.warn, margin: [0, 0, 0, 8] },
    {
      table: {
        widths: ['*'],
        body: [
          [
            {
              stack: CAUTIONS.map((c, i) => ({ text: [{ text: `${i + 1}. ${c.lead} `, bold: true }, c.text], fontSize: 9.5, lineHeight: 1.32, margin: [0, i === 0 ? 0 : 7, 0, 0] })),
              margin: [12, 10, 12, 10],
              fillColor: '#fff8f0',
            },
          ],
        ],
      },
      layout: { hLineWidth: () => 0, vLineWidth: (i: number) => (i === 0 ? 3 : 0), vLineColor: () => '#e8590c', paddingLeft: () => 0, paddingRight: () => 0, paddingTop: () => 0, paddingBottom: () => 0 },
    },
  ];
}
