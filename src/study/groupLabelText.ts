/**
 * Surface groups named by the user's labels (a probe set's `groupLabels`: group name in the file → label) in
 * the text of results. The evaluators write a group as its id and quoted name (`force on 1 "wall"`); only
 * that form is relabelled, so other quoted text (field names) is left alone. Pure: no DOM.
 */
import type { SetEvaluation } from './evaluate.ts';

/** Lookup of a label by the group's name in the file. */
export type LabelOf = (name: string) => string | undefined;

/** `text` with every `<id> "<name>"` of a relabelled group written `<id> "<label>"`. */
export function relabelGroups(text: string, labelOf: LabelOf): string {
  return text.replace(/(\d+ )"([^"]*)"/g, (m, id: string, name: string) => { const l = labelOf(name); return l === undefined ? m : `${id}"${l}"`; });
}

/** An evaluation whose probe definitions name groups by `labels` (unchanged when there are none). */
export function relabelEvaluation(e: SetEvaluation, labels: Readonly<Record<string, string>> | undefined): SetEvaluation {
  if (!labels || Object.keys(labels).length === 0) return e;
  const labelOf: LabelOf = (n) => (Object.prototype.hasOwnProperty.call(labels, n) ? labels[n] : undefined);
  return { ...e, probes: e.probes.map((p) => ({ ...p, definition: relabelGroups(p.definition, labelOf) })) };
}
