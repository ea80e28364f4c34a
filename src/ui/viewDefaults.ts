/** View settings every newly opened file starts from (one place for their defaults). Pure: no DOM. */

/** Above this many boundary faces the face outlines start off: drawn, they would turn a fine mesh's surface black. */
export const OUTLINE_FACE_LIMIT = 200_000;

/** Whether face outlines start on for a surface of `faces` boundary faces. */
export function outlinesShownFor(faces: number): boolean {
  return faces <= OUTLINE_FACE_LIMIT;
}
