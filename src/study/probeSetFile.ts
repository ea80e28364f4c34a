/**
 * Reading and writing probe-set documents: JSON text in, a checked current-version `ProbeSet` out (older
 * versions are upgraded), and back to JSON with a stable member order so saved files diff cleanly.
 * A document that is not JSON, not a probe set, of an unknown version or malformed is refused with an
 * error that says where and what; nothing is half-read.
 */
import { DocumentError, describeValue } from './checkValues.ts';
import { jsonErrorOffset, lineColumn } from './jsonPosition.ts';
import { MEMBERS, checkProbeSet } from './probeSetCheck.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type Probe, type ProbeSet } from './probeSet.ts';
import { checkProbeSetV1, upgradeV1 } from './probeSetV1.ts';

/** Versions this code reads. */
export const READABLE_VERSIONS = [1, 2] as const;

/** A read document and the version it was written in (less than the current one when upgraded). */
export interface ReadProbeSet {
  set: ProbeSet;
  fromVersion: number;
}

/** Checks a parsed JSON value as a probe set of any readable version; upgrades old versions. */
export function probeSetFromJson(doc: unknown, source = 'probe set'): ReadProbeSet {
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) {
    throw new DocumentError(source, [{ path: '', expected: `a probe-set object ({"format": "${PROBE_SET_FORMAT}", …})`, found: describeValue(doc) }]);
  }
  const o = doc as Record<string, unknown>;
  if (o['format'] !== PROBE_SET_FORMAT) {
    throw new DocumentError(source, [{ path: 'format', expected: `"${PROBE_SET_FORMAT}" (this is not a fieldtally probe set)`, found: describeValue(o['format']) }]);
  }
  const v = o['version'];
  if (v === 1) return { set: upgradeV1(checkProbeSetV1(doc, source)), fromVersion: 1 };
  if (v === PROBE_SET_VERSION) return { set: checkProbeSet(doc, source), fromVersion: PROBE_SET_VERSION };
  const newer = typeof v === 'number' && Number.isInteger(v) && v > PROBE_SET_VERSION;
  throw new DocumentError(source, [{
    path: 'version',
    expected: newer ? `a version this fieldtally reads (${READABLE_VERSIONS.join(' or ')}); version ${v} is newer — update fieldtally`
      : `a version this fieldtally reads (${READABLE_VERSIONS.join(' or ')})`,
    found: describeValue(v),
  }]);
}

/** Deepest nesting of arrays and objects a probe set may have (the format itself nests about 6 deep). */
export const MAX_PROBE_SET_DEPTH = 64;

/** Offset of the first bracket nested deeper than `max` in JSON text (strings skipped), or −1. */
export function tooDeepAt(text: string, max: number): number {
  let depth = 0, inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92) i++; // backslash: skip the escaped character
      else if (c === 34) inString = false;
    } else if (c === 34) inString = true;
    else if (c === 91 || c === 123) { if (++depth > max) return i; }
    else if (c === 93 || c === 125) depth--;
  }
  return -1;
}

/** Parses JSON text as a probe set (see `probeSetFromJson`); nesting beyond `MAX_PROBE_SET_DEPTH` is refused before parsing. */
export function readProbeSet(text: string, source = 'probe set'): ReadProbeSet {
  let doc: unknown;
  const deep = tooDeepAt(text, MAX_PROBE_SET_DEPTH);
  if (deep >= 0) {
    throw new DocumentError(source, [{ path: '', expected: `JSON nested at most ${MAX_PROBE_SET_DEPTH} deep`, found: `deeper nesting at ${lineColumn(text, deep)}` }]);
  }
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const at = jsonErrorOffset(text);
    const where = at >= 0 ? ` at ${lineColumn(text, at)}` : '';
    throw new DocumentError(source, [{ path: '', expected: 'JSON text', found: `text that is not JSON${where} (${(e as Error).message.split('\n')[0]})` }]);
  }
  return probeSetFromJson(doc, source);
}

function ordered<T extends object>(o: T, order: readonly string[]): T {
  const out: Record<string, unknown> = {};
  for (const k of order) if ((o as Record<string, unknown>)[k] !== undefined) out[k] = (o as Record<string, unknown>)[k];
  for (const [k, v] of Object.entries(o)) if (!(k in out) && v !== undefined) out[k] = v;
  return out as T;
}

/** The document with members in the schema's order (top level and probes). */
export function canonicalProbeSet(set: ProbeSet): ProbeSet {
  return ordered({ ...set, probes: set.probes.map((p) => ordered<Probe>(p, MEMBERS.cutPlaneProbe)) }, MEMBERS.document);
}

/** JSON text of a probe set (2-space indent, stable member order, arrays of numbers on one line, newline at the end). */
export function writeProbeSet(set: ProbeSet): string {
  return JSON.stringify(canonicalProbeSet(set), null, 2)
    // only the line breaks JSON.stringify puts into arrays (a string never holds a raw line break)
    .replace(/\[\n\s*(-?[\d.eE+-]+(?:,\n\s*-?[\d.eE+-]+)*)\n\s*\]/g, (_m, items: string) => `[${items.split(/,\n\s*/).join(', ')}]`) + '\n';
}
