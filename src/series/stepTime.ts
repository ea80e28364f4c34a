/**
 * A step's time from its dataset-level field data: the array named `TimeValue` (the name VTK's writers
 * use), its first value. Used when a series has no collection file.
 */
import type { FieldArray } from '../model/fieldArray.ts';

/** Name of the field-data array that holds a file's time. */
export const TIME_ARRAY = 'TimeValue';

/** The file's time, undefined when it has no `TimeValue`; throws naming the file when the array is empty or not finite. */
export function timeFromFieldData(fieldData: readonly FieldArray[], file: string): number | undefined {
  const f = fieldData.find((a) => a.name === TIME_ARRAY);
  if (!f) return undefined;
  if (f.values.length === 0) throw new Error(`${file}: field data "${TIME_ARRAY}" holds no value; expected one time`);
  const t = Number(f.values[0]);
  if (!Number.isFinite(t)) throw new Error(`${file}: field data "${TIME_ARRAY}" is ${t}; expected a finite time`);
  return t;
}
