/**
 * Version 1 of the probe-set document, the first shape fieldtally wrote, and its upgrade to the current
 * version. Version 1 had no units (files were taken as SI), no regions on planes, no pressure-loss or
 * mass-balance probes, and flat probes:
 *
 *   { "format": "fieldtally-probe-set", "version": 1, "name": "…",
 *     "reference": { "rho", "U", "A", "L", "pRef", "mu", "dragDir", "liftDir", "momentAbout" },
 *     "probes": [ { "id", "type": "plane", "label", "origin", "normal", "rho"? },
 *                 { "id", "type": "line", "from", "to", "samples"? },
 *                 { "id", "type": "point", "at" },
 *                 { "id", "type": "force", "surfaces": [...] } ] }
 *
 * A plane's `rho` was the constant density of its flow rates. The upgrade keeps every value and meaning.
 */
import { Checks, DocumentError, at } from './checkValues.ts';
import { LIMITS } from './probeSetCheck.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type Probe, type ProbeSet, type ReferenceDoc, type Vec3 } from './probeSet.ts';

interface V1Probe {
  id: string;
  type: 'plane' | 'line' | 'point' | 'force';
  label?: string;
  origin?: Vec3; normal?: Vec3; rho?: number;
  from?: Vec3; to?: Vec3; samples?: number;
  at?: Vec3;
  surfaces?: (string | number)[];
}

/** A version-1 document. */
export interface ProbeSetV1 {
  format: typeof PROBE_SET_FORMAT;
  version: 1;
  name?: string;
  reference?: { rho?: number; U?: number; A?: number; L?: number; pRef?: number; mu?: number; dragDir?: Vec3; liftDir?: Vec3; momentAbout?: Vec3 };
  probes: V1Probe[];
}

const REFERENCE_V1 = ['rho', 'U', 'A', 'L', 'pRef', 'mu', 'dragDir', 'liftDir', 'momentAbout'];
const MEMBERS_V1: Record<V1Probe['type'], string[]> = {
  plane: ['id', 'type', 'label', 'origin', 'normal', 'rho'],
  line: ['id', 'type', 'label', 'from', 'to', 'samples'],
  point: ['id', 'type', 'label', 'at'],
  force: ['id', 'type', 'label', 'surfaces'],
};

/** Checks a version-1 document; throws a `DocumentError` listing every issue. */
export function checkProbeSetV1(doc: unknown, source = 'probe set'): ProbeSetV1 {
  const c = new Checks();
  const o = c.object(doc, '', ['format', 'version', 'name', 'reference', 'probes'], ['format', 'version', 'probes']);
  if (o) {
    c.optional(o, 'name', '', (x, p) => c.string(x, p, { maxLength: LIMITS.textMax }));
    c.optional(o, 'reference', '', (x, p) => {
      const r = c.object(x, p, REFERENCE_V1);
      if (!r) return;
      for (const k of ['rho', 'U', 'A', 'L', 'mu']) c.optional(r, k, p, (y, q) => c.number(y, q, { above: 0 }));
      c.optional(r, 'pRef', p, (y, q) => c.number(y, q));
      c.optional(r, 'dragDir', p, (y, q) => c.vec3(y, q, true));
      c.optional(r, 'liftDir', p, (y, q) => c.vec3(y, q, true));
      c.optional(r, 'momentAbout', p, (y, q) => c.vec3(y, q));
    });
    const ids = new Set<string>();
    c.optional(o, 'probes', '', (x, p) => c.array(x, p, (y, q) => {
      if (typeof y !== 'object' || y === null || Array.isArray(y)) return c.fail(q, 'a probe object', y);
      const type = (y as Record<string, unknown>)['type'];
      const t = c.oneOf(type, at(q, 'type'), ['plane', 'line', 'point', 'force'] as const);
      if (!t) return;
      const m = MEMBERS_V1[t];
      const pr = c.object(y, q, m, m.filter((k) => k !== 'label' && k !== 'rho' && k !== 'samples'))!;
      const id = pr['id'] === undefined ? undefined : c.string(pr['id'], at(q, 'id'), { pattern: LIMITS.idPattern, patternText: 'an id of letters, digits, ".", "_" or "-"' });
      if (id !== undefined) { if (ids.has(id)) c.fail(at(q, 'id'), 'an id not used before', id); ids.add(id); }
      c.optional(pr, 'label', q, (z, r) => c.string(z, r, { maxLength: LIMITS.textMax }));
      c.optional(pr, 'origin', q, (z, r) => c.vec3(z, r));
      c.optional(pr, 'normal', q, (z, r) => c.vec3(z, r, true));
      c.optional(pr, 'rho', q, (z, r) => c.number(z, r, { above: 0 }));
      c.optional(pr, 'from', q, (z, r) => c.vec3(z, r));
      c.optional(pr, 'to', q, (z, r) => c.vec3(z, r));
      c.optional(pr, 'samples', q, (z, r) => c.number(z, r, { integer: true, min: LIMITS.samplesMin, max: LIMITS.samplesMax }));
      c.optional(pr, 'at', q, (z, r) => c.vec3(z, r));
      c.optional(pr, 'surfaces', q, (z, r) => c.array(z, r, (s, u) =>
        (typeof s === 'string' && s.length > 0) || (typeof s === 'number' && Number.isInteger(s)) ? s : c.fail(u, 'a surface group name or whole-number id', s), 1));
      return y;
    }));
  }
  if (c.issues.length) throw new DocumentError(source, c.issues);
  return structuredClone(doc) as ProbeSetV1;
}

/** Upgrades a checked version-1 document to the current version (same probes, same meaning, SI units). */
export function upgradeV1(v1: ProbeSetV1): ProbeSet {
  const r = v1.reference ?? {};
  const reference: ReferenceDoc = {};
  if (r.rho !== undefined) reference.density = r.rho;
  if (r.mu !== undefined) reference.viscosity = r.mu;
  if (r.U !== undefined) reference.speed = r.U;
  if (r.A !== undefined) reference.area = r.A;
  if (r.L !== undefined) reference.length = r.L;
  if (r.pRef !== undefined) reference.pressure = r.pRef;
  if (r.dragDir) reference.dragDirection = r.dragDir;
  if (r.liftDir) reference.liftDirection = r.liftDir;
  if (r.momentAbout) reference.momentPoint = r.momentAbout;
  const probes: Probe[] = v1.probes.map((p): Probe => {
    const base = { id: p.id, ...(p.label !== undefined ? { label: p.label } : {}) };
    switch (p.type) {
      case 'plane':
        return { ...base, kind: 'cut-plane', geometry: { origin: p.origin!, normal: p.normal! }, ...(p.rho !== undefined ? { fields: { density: p.rho } } : {}) };
      case 'line':
        return { ...base, kind: 'line', geometry: { from: p.from!, to: p.to! }, ...(p.samples !== undefined ? { options: { samples: p.samples } } : {}) };
      case 'point':
        return { ...base, kind: 'point', geometry: { at: p.at! } };
      case 'force':
        return { ...base, kind: 'force', geometry: { surfaces: p.surfaces! } };
    }
  });
  return {
    format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION,
    ...(v1.name !== undefined ? { title: v1.name } : {}),
    units: { length: 'm' },
    ...(Object.keys(reference).length ? { reference } : {}),
    probes,
  };
}
