/**
 * Reading the formula parser's one-line messages (src/derive/formulaParse.ts: `column N: … expected …`)
 * for the editor. Pure: no DOM.
 */

/** The 1-based column a parser message names, or undefined when it names none. */
export function errorColumn(message: string): number | undefined {
  const m = /\bcolumn (\d+)\b/.exec(message);
  return m ? Number(m[1]) : undefined;
}
