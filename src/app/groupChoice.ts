/**
 * Surface groups chosen by what they are in the app: the words of the "by what they are" fields (a name, a
 * box that holds the group, an area range) read into a `GroupSelector` (src/surface/groupSelect.ts), and the
 * groups of the open file it picks. The probe set keeps the selector, so the same wall is found in another
 * file whatever its group numbers there. Pure: no DOM.
 */
import type { GroupInfo } from '../../workers/api.ts';
import { noGroupError, selectByTraits, type GroupRef, type GroupSelector } from '../surface/groupSelect.ts';

/** The fields as typed: any may be empty (then it does not restrict). */
export interface GroupChoiceText {
  /** The group's name exactly. */
  name: string;
  /** `xmin, xmax, ymin, ymax, zmin, zmax` (file length unit): groups lying inside this box. */
  box: string;
  /** Smallest area (file length unit²). */
  areaFrom: string;
  /** Largest area (file length unit²). */
  areaTo: string;
}

export const EMPTY_CHOICE: GroupChoiceText = { name: '', box: '', areaFrom: '', areaTo: '' };

/**
 * The selector the fields describe.
 * @throws Error naming the field and what it expected, or when every field is empty.
 */
export function selectorFromText(t: GroupChoiceText): GroupSelector {
  const s: { name?: string; within?: [number, number, number, number, number, number]; areaFrom?: number; areaTo?: number } = {};
  if (t.name.trim()) s.name = t.name.trim();
  if (t.box.trim()) {
    const v = t.box.split(/[,;\s]+/).filter(Boolean).map(Number);
    if (v.length !== 6 || v.some((x) => !Number.isFinite(x))) throw new Error(`box: expected six numbers xmin, xmax, ymin, ymax, zmin, zmax, got "${t.box.trim()}"`);
    for (let k = 0; k < 6; k += 2) if (v[k]! > v[k + 1]!) throw new Error(`box: ${'xyz'[k / 2]}min ${v[k]} is above ${'xyz'[k / 2]}max ${v[k + 1]}`);
    s.within = v as [number, number, number, number, number, number];
  }
  for (const [key, label] of [['areaFrom', 'area from'], ['areaTo', 'area to']] as const) {
    const text = t[key].trim();
    if (!text) continue;
    const a = Number(text);
    if (!Number.isFinite(a) || a < 0) throw new Error(`${label}: expected a number ≥ 0 (file length unit²), got "${text}"`);
    s[key] = a;
  }
  if (s.areaFrom !== undefined && s.areaTo !== undefined && s.areaFrom > s.areaTo) throw new Error(`area: from ${s.areaFrom} is above to ${s.areaTo}`);
  if (Object.keys(s).length === 0) throw new Error('give a name, a box or an area range to choose surfaces by');
  return s;
}

/**
 * Ids (`GroupInfo.id`, ascending) of the open file's groups a selector picks (`nearest` is not read: it needs
 * the faces, which stay in the worker).
 * @throws Error naming the selector and the known groups (by their ids in the file) when none matches.
 */
export function groupsChosen(groups: readonly GroupInfo[], s: GroupSelector): number[] {
  const traits = groups.map((g) => ({ id: g.fileId, name: g.name, area: g.area, bounds: g.bounds }));
  const picked = selectByTraits(traits, s);
  if (picked.length === 0) throw noGroupError(traits, s);
  return picked.map((i) => groups[i]!.id).sort((a, b) => a - b);
}

/**
 * Ids (`GroupInfo.id`, in the references' order, a selector's ascending) of the open file's groups that probe-set
 * references name: a name used once, else an id in the file (`fileId`), or a selector. Undefined when one is
 * unknown or matches nothing, or is a selector with `nearest` (it needs the faces: the worker evaluates those).
 */
export function groupIdsOf(groups: readonly GroupInfo[], refs: readonly GroupRef[]): number[] | undefined {
  const out: number[] = [];
  for (const r of refs) {
    if (typeof r === 'object') {
      if (r.nearest) return undefined;
      try { out.push(...groupsChosen(groups, r)); } catch { return undefined; }
      continue;
    }
    const byName = groups.filter((g) => g.name === String(r));
    const g = byName.length === 1 ? byName[0] : byName.length === 0 && /^-?\d+$/.test(String(r)) ? groups.find((x) => x.fileId === Number(r)) : undefined;
    if (!g) return undefined;
    out.push(g.id);
  }
  return out;
}

/** How a probe set refers to one group of the open file: by its name when no other group has it, else by its id in the file. */
export function groupRef(groups: readonly GroupInfo[], g: GroupInfo): string | number {
  return groups.filter((x) => x.name === g.name).length === 1 ? g.name : g.fileId;
}
