/**
 * Notes on a probe's result, each either an explanation (why a number is absent or how it was got, for an
 * ordinary case: a centre of pressure undefined for a symmetric body, pressure read as cell data) shown in
 * a neutral style, or a warning (a failed probe, missing inputs, a plane that misses the mesh, a surface
 * that is not closed) shown in the warning colour. The compute layers write notes as text; the
 * explanations are recognised here by their opening words, and anything not recognised stays a warning, so
 * a new kind of note draws attention until it is classed. Pure: no DOM.
 */

export type NoteLevel = 'info' | 'warning';

/** One note of a result. */
export interface ResultNote {
  text: string;
  level: NoteLevel;
}

/**
 * Notes that explain an ordinary result (patterns on the compute layers' texts: src/surface/forces.ts,
 * surfaceLoads.ts, src/cut/integrals.ts, composite.ts, src/study/evaluate*.ts, and the view's tools).
 */
const EXPLANATIONS: readonly RegExp[] = [
  /^centre of pressure undefined\b/,
  /^lift \([^)]*\) derived: /,
  /^lift direction was not orthogonal to the drag direction/,
  /^viscous force not computed \(viscous: none\)/,
  /^(pressure|wall shear) "[^"]*" read as kinematic/,
  /^(pressure|velocity) "[^"]*" is cell data/,
  /^[^ ]+ is cell data: the value of the cell holding the point/,
  /^density is a field\b/,
  /^no density on every surface: the balance is of volume flow/,
  /^region: /,
  /^boundary layer: /,
];

/** The level of a note by its text (see `EXPLANATIONS`); a failure is always a warning. */
export function noteLevel(text: string): NoteLevel {
  if (/^FAILED\b/.test(text)) return 'warning';
  return EXPLANATIONS.some((re) => re.test(text)) ? 'info' : 'warning';
}

/** Notes from texts, each with its level. */
export function classifyNotes(texts: readonly string[]): ResultNote[] {
  return texts.map((text) => ({ text, level: noteLevel(text) }));
}

/** Every note's text, `; `-separated (exports, and a pin without numbers). */
export function notesText(notes: readonly ResultNote[] | undefined): string {
  return (notes ?? []).map((n) => n.text).join('; ');
}
