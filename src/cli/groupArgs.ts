/**
 * The command line's ways of naming surface groups, shared by `force` and `wall`: `--groups a,b` (ids or
 * names) and a selector choosing groups by what they are (src/surface/groupSelect.ts), whose options all
 * apply together:
 *   --groups-within xmin,xmax,ymin,ymax,zmin,zmax   groups whose bounds lie inside the box
 *   --group-nearest-to x,y,z                        the one group with a face centroid nearest the point
 *   --groups-area-from a / --groups-area-to b       groups with area in [a, b] (length unit²)
 *   --group-named name                              groups of exactly this name (commas allowed)
 */
import type { GroupRef, GroupSelector } from '../surface/groupSelect.ts';
import { parseNumber, parseVec3, quoteArg, str, type OptionKind, type ParsedArgs } from './args.ts';

export const GROUP_SELECT_OPTIONS: Record<string, OptionKind> = {
  'groups-within': 'string', 'group-nearest-to': 'string', 'groups-area-from': 'string', 'groups-area-to': 'string', 'group-named': 'string',
};

export const GROUP_SELECT_HELP = [
  '  choosing groups by what they are (all given apply; lengths in the file\'s unit, areas in its square; with --groups: both):',
  '  --groups-within xmin,xmax,ymin,ymax,zmin,zmax  groups whose bounds lie inside this box',
  '  --group-nearest-to x,y,z   the one group with a face centroid nearest this point',
  '  --groups-area-from a, --groups-area-to b   groups whose area lies in [a, b]',
  '  --group-named name         groups named exactly so (a name holding commas)',
].join('\n');

/** The selector the options give, or undefined when none is given. */
export function groupSelectorOf(args: ParsedArgs): GroupSelector | undefined {
  const within = str(args, 'groups-within'), nearest = str(args, 'group-nearest-to'), from = str(args, 'groups-area-from'), to = str(args, 'groups-area-to');
  const name = str(args, 'group-named');
  if ([within, nearest, from, to, name].every((x) => x === undefined)) return undefined;
  const s: { -readonly [K in keyof GroupSelector]: GroupSelector[K] } = {};
  if (name !== undefined) {
    if (name.trim() === '') throw new Error('--group-named: expected a group name, got an empty text');
    s.name = name;
  }
  if (within !== undefined) {
    const parts = within.split(',');
    if (parts.length !== 6) throw new Error(`--groups-within: expected six numbers xmin,xmax,ymin,ymax,zmin,zmax, got ${quoteArg(within)}`);
    const b = parts.map((p) => parseNumber(p, 'groups-within')) as [number, number, number, number, number, number];
    if (b[0] > b[1] || b[2] > b[3] || b[4] > b[5]) throw new Error(`--groups-within: each min must not exceed its max, got ${quoteArg(within)}`);
    s.within = b;
  }
  if (nearest !== undefined) s.nearest = parseVec3(nearest, 'group-nearest-to');
  for (const [text, key, option] of [[from, 'areaFrom', 'groups-area-from'], [to, 'areaTo', 'groups-area-to']] as const) {
    if (text === undefined) continue;
    const v = parseNumber(text, option);
    if (v < 0) throw new Error(`--${option}: expected an area ≥ 0, got ${quoteArg(text)}`);
    s[key] = v;
  }
  if (s.areaFrom !== undefined && s.areaTo !== undefined && s.areaFrom > s.areaTo) throw new Error(`--groups-area-to: ${s.areaTo} is below --groups-area-from ${s.areaFrom}`);
  return s;
}

/** Every group reference the options give (`--groups` items, then the selector). @throws when there is none. */
export function groupRefsOf(args: ParsedArgs, verb: string): GroupRef[] {
  const listed = (str(args, 'groups') ?? '').split(',').map((t) => t.trim()).filter(Boolean);
  const sel = groupSelectorOf(args);
  const refs: GroupRef[] = [...listed, ...(sel ? [sel] : [])];
  if (refs.length === 0) {
    throw new Error(`--groups is required (or a choice by --groups-within, --group-nearest-to, --groups-area-from/-to, --group-named): surface group ids or names (list them with \`fieldtally surfaces <file>\`; ${verb})`);
  }
  return refs;
}
