// The standing caution of every result, in one place for every screen, e-mail and export that
// carries results: a planning aid, not an order, deferring to the jurisdiction's plan, local
// codes and a licensed traffic engineer. The briefing's longer "Cautions and limits" page
// (server/services/briefings/sections/cautions.ts) says the same at length.
export const CAUTION_LEAD = 'A planning aid, not an order.';

export const CAUTION_TEXT =
  'Figures are upper bounds that depend on the road data and the stated assumptions; real evacuations run slower. ' +
  "Defer to the jurisdiction's emergency operations plan and local emergency management codes, and have any change to roads or traffic control reviewed by a licensed traffic engineer.";

/** Lead and text as one line, for e-mails, exports and short notes. */
export const CAUTION_LINE = `${CAUTION_LEAD} ${CAUTION_TEXT}`;
