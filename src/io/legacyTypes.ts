/**
 * Data-type names of legacy `.vtk` files mapped onto the shared element types, with the binary layout
 * VTK's legacy writer uses for each (always big-endian).
 *
 * `vtkIdType` arrays are written as 32-bit integers by VTK's legacy writer whatever the build's id
 * size (see `triangle_vtkidtype.vtk`: 64-bit OFFSETS next to 32-bit vtkIdType field arrays), so they
 * are read as Int32. `long`/`unsigned_long` are 64-bit (the LP64 layout of the writers in use).
 */
import type { ElementType } from './elementTypes.ts';
import { quoted } from './legacyCursor.ts';

/** What a type word means: a numeric element type, or a string array (skipped by the reader). */
export type LegacyType = ElementType | 'string';

const TYPES: Readonly<Record<string, LegacyType>> = {
  unsigned_char: 'UInt8', char: 'Int8', signed_char: 'Int8',
  unsigned_short: 'UInt16', short: 'Int16',
  unsigned_int: 'UInt32', int: 'Int32',
  unsigned_long: 'UInt64', long: 'Int64',
  unsigned_long_long: 'UInt64', long_long: 'Int64',
  vtkidtype: 'Int32',
  vtktypeint8: 'Int8', vtktypeuint8: 'UInt8', vtktypeint16: 'Int16', vtktypeuint16: 'UInt16',
  vtktypeint32: 'Int32', vtktypeuint32: 'UInt32', vtktypeint64: 'Int64', vtktypeuint64: 'UInt64',
  vtktypefloat32: 'Float32', vtktypefloat64: 'Float64',
  float: 'Float32', double: 'Float64',
  string: 'string', utf8_string: 'string',
};

const NUMERIC_NAMES = 'unsigned_char, char, unsigned_short, short, unsigned_int, int, unsigned_long, long, vtkIdType, vtktypeint64, vtktypeuint64, float or double';

/** Maps a legacy type word (any case) to its element type; throws naming `where` for `bit` and unknown words. */
export function legacyType(word: string, where: string): LegacyType {
  const t = TYPES[word.toLowerCase()];
  if (t) return t;
  if (word.toLowerCase() === 'bit') {
    throw new Error(`${where}: data type "bit" (packed bits) is not supported; expected ${NUMERIC_NAMES}`);
  }
  throw new Error(`${where}: data type ${quoted(word)} is not supported; expected ${NUMERIC_NAMES}`);
}

/** Like `legacyType`, for places that need numbers (points, cells, attributes): string arrays are refused. */
export function numericType(word: string, where: string): ElementType {
  const t = legacyType(word, where);
  if (t === 'string') throw new Error(`${where}: data type ${quoted(word)} holds text; expected a numeric type (${NUMERIC_NAMES})`);
  return t;
}

/** Smallest and largest value an integer element type holds (64-bit types: the exactly representable ±2^53). */
export function integerRange(t: ElementType): [number, number] | undefined {
  switch (t) {
    case 'Int8': return [-128, 127];
    case 'UInt8': return [0, 255];
    case 'Int16': return [-32768, 32767];
    case 'UInt16': return [0, 65535];
    case 'Int32': return [-2147483648, 2147483647];
    case 'UInt32': return [0, 4294967295];
    case 'Int64': return [-(2 ** 53), 2 ** 53];
    case 'UInt64': return [0, 2 ** 53];
    default: return undefined;
  }
}
