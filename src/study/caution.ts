/**
 * The safety caution carried by every report, export, CSV and the app's about box. One text, imported by the
 * command line (`src/cli/`), the app (`src/app/`, `src/ui/`) and the report writers (`src/study/`).
 */
export const CAUTION =
  'These numbers are only as good as the simulation that produced the file, its mesh and its boundary ' +
  'conditions. Check mesh convergence before relying on them, and defer to the applicable codes and ' +
  'to review by a licensed professional for any engineering decision.';

/** The caution as a CSV comment line (`# Caution: …`), the form every CSV we write carries before its header. */
export const CAUTION_CSV_LINE = `# Caution: ${CAUTION}`;
