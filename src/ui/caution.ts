/** The safety caution that every report, export and the about box carry. */
export const CAUTION =
  'These numbers are only as good as the simulation that produced the file, its mesh and its boundary ' +
  'conditions. Check mesh convergence before relying on them, and defer to the applicable codes and ' +
  'to review by a licensed professional for any engineering decision.';
