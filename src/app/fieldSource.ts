/**
 * What a tool adds to the viewer's colour chooser beyond the file's own arrays: derived fields made on
 * demand, user formulas, wall quantities of a surface group. A source lists its entries and, when one is
 * chosen, either makes it a field of the held dataset (then the viewer colours by that field like any
 * other) or hands over the drawn surface's values itself.
 */
import type { DrawingValues } from '../../workers/api.ts';

/** A chooser entry: `key` never starts with `point:` or `cell:` (those are the file's fields). */
export interface SourceEntry {
  label: string;
  key: string;
}

/** How a chosen entry is coloured. */
export type ResolvedColour =
  | { kind: 'field'; key: string }
  | { kind: 'values'; values: DrawingValues; title: string; unit: string };

export interface FieldSource {
  /** Entries to offer now (re-read whenever the chooser is rebuilt). */
  entries(): SourceEntry[];
  /** Whether `key` is one of this source's. */
  owns(key: string): boolean;
  /** Makes the entry colourable; rejects with a one-line message when it cannot be made. */
  resolve(key: string): Promise<ResolvedColour>;
}
