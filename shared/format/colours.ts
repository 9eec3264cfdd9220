// Colours that mean one thing wherever a result is drawn, on the workspace map and in the
// briefing's map and tables alike.

/** Choke points: a deep violet, apart from the yellow-to-red utilisation bands underneath. */
export const CHOKE_POINT_COLOUR = '#4a1d7a';
