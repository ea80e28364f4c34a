/**
 * Grid-convergence study: the same probe set on three meshes of one case gives, per quantity, the
 * estimate of Celik et al. (2008), J. Fluids Eng. 130, 078001 (`gci.ts`; formulas in
 * docs/references.md §6): apparent order, extrapolated value, approximate and extrapolated relative
 * errors and the fine-grid convergence index. The mesh size is h = (ΣV/N)^(1/3) over the 3D cells
 * (`volumeSummary`), in metres. Oscillatory or divergent behaviour is reported as such with no numbers
 * forced; a quantity missing on any mesh (its probe failed there) is listed with the reason.
 */
import { volumeSummary } from '../model/cellMeasure.ts';
import type { Dataset } from '../model/dataset.ts';
import type { SetEvaluation } from './evaluate.ts';
import { gridConvergence, meshSize3D, type GciResult } from './gci.ts';
import { sig6 } from './resultTables.ts';
import { unitLabel } from './units.ts';

/** A mesh's representative size. */
export interface MeshSize {
  /** 3D cells. */
  cells: number;
  /** Σ|V| over 3D cells, m³. */
  volume: number;
  /** h = (volume/cells)^(1/3), m. */
  h: number;
}

/** The mesh size of a dataset; `lengthFactor` is metres per file length unit. Throws for a mesh without 3D cells. */
export function meshSize(d: Dataset, lengthFactor = 1): MeshSize {
  const s = volumeSummary(d);
  if (s.cells3D === 0 || !(s.volume > 0)) throw new Error(`${d.source}: no 3D cells with volume: the grid-convergence estimate needs volume meshes`);
  const volume = s.volume * lengthFactor ** 3;
  return { cells: s.cells3D, volume, h: meshSize3D(volume, s.cells3D) };
}

/** One mesh of the study. */
export interface GridLevel {
  file: string;
  size: MeshSize;
  evaluation: SetEvaluation;
}

export interface GridQuantity {
  probe: string;
  probeLabel: string;
  key: string;
  label: string;
  unit: string;
  /** Values on the fine, medium and coarse mesh (null where missing). */
  phi: [number | null, number | null, number | null];
  /** Null when a value is missing (see `missing`). */
  result: GciResult | null;
  missing: string | null;
}

export interface GridStudy {
  /** The meshes, fine → coarse. */
  levels: [GridLevel, GridLevel, GridLevel];
  quantities: GridQuantity[];
}

/**
 * The study over three levels given in any order (sorted here by h, fine first). `only` limits it to
 * `probe` or `probe.key` names. Throws when two meshes have the same size.
 */
export function gridStudy(levels: readonly GridLevel[], only?: readonly string[]): GridStudy {
  if (only?.length === 0) only = undefined;
  if (levels.length !== 3) throw new Error(`gci: needs exactly three meshes, got ${levels.length}`);
  const sorted = [...levels].sort((a, b) => a.size.h - b.size.h) as [GridLevel, GridLevel, GridLevel];
  const [f, m, c] = sorted;
  if (!(f.size.h < m.size.h && m.size.h < c.size.h)) {
    throw new Error(`gci: the three meshes need different sizes; h = ${sorted.map((l) => `${sig6(l.size.h)} m (${l.file})`).join(', ')}`);
  }
  const quantities: GridQuantity[] = [];
  const wanted = (id: string) => !only || only.includes(id) || only.some((o) => o.startsWith(`${id}.`));
  for (const pf of f.evaluation.probes) {
    if (!wanted(pf.id)) continue;
    const pm = m.evaluation.probes.find((p) => p.id === pf.id), pc = c.evaluation.probes.find((p) => p.id === pf.id);
    for (const q of pf.quantities) {
      if (only && !only.includes(pf.id) && !only.includes(`${pf.id}.${q.key}`)) continue;
      const vm = pm?.quantities.find((x) => x.key === q.key)?.value ?? null;
      const vc = pc?.quantities.find((x) => x.key === q.key)?.value ?? null;
      const phi: GridQuantity['phi'] = [q.value, vm, vc];
      let missing: string | null = null;
      if (vm === null) missing = `missing on the medium mesh ${m.file}${pm && !pm.ok ? `: ${pm.error}` : ''}`;
      else if (vc === null) missing = `missing on the coarse mesh ${c.file}${pc && !pc.ok ? `: ${pc.error}` : ''}`;
      const result = missing ? null : gridConvergence({ h: [f.size.h, m.size.h, c.size.h], phi: [q.value, vm!, vc!] });
      quantities.push({ probe: pf.id, probeLabel: pf.label, key: q.key, label: q.label, unit: q.unit, phi, result, missing });
    }
    if (!pf.ok) quantities.push({ probe: pf.id, probeLabel: pf.label, key: '', label: '', unit: '', phi: [null, null, null], result: null, missing: `failed on the fine mesh ${f.file}: ${pf.error}` });
  }
  return { levels: sorted, quantities };
}

/** The study as JSON-ready data (fractions, not percent). */
export function gridStudyJson(s: GridStudy): Record<string, unknown> {
  return {
    reference: 'Celik et al. (2008), J. Fluids Eng. 130(7), 078001; safety factor 1.25 (three grids)',
    meshes: s.levels.map((l, i) => ({ level: ['fine', 'medium', 'coarse'][i], file: l.file, cells: l.size.cells, volume: l.size.volume, h: l.size.h })),
    refinementRatios: { r21: s.levels[1].size.h / s.levels[0].size.h, r32: s.levels[2].size.h / s.levels[1].size.h },
    quantities: s.quantities.map((q) => ({
      probe: q.probe, label: q.probeLabel, quantity: q.key, symbol: q.label, unit: q.unit,
      fine: q.phi[0], medium: q.phi[1], coarse: q.phi[2], missing: q.missing,
      ...(q.result ? {
        behaviour: q.result.kind, ratio: q.result.ratio, apparentOrder: q.result.order, extrapolated: q.result.extrapolated,
        approximateRelativeError: q.result.approxRelError, extrapolatedRelativeError: q.result.extrapRelError,
        gciFine: q.result.gciFine, gciMedium: q.result.gciMedium, asymptoticRatio: q.result.asymptoticRatio, notes: q.result.notes,
      } : {}),
    })),
    units: 'h in m; values in the unit given per quantity; relative errors and GCI as fractions (0.01 = 1 %)',
  };
}

const pct = (v: number | null): string => (v === null ? '—' : `${(100 * v).toPrecision(3)} %`);

/** Aligned text. */
export function gridStudyText(s: GridStudy): string[] {
  const lines = ['meshes (fine → coarse), h = (volume / cells)^(1/3):'];
  for (const l of s.levels) lines.push(`  ${l.file}: ${l.size.cells} cells, h = ${sig6(l.size.h)} m`);
  lines.push(`  refinement ratios r21 = ${sig6(s.levels[1].size.h / s.levels[0].size.h)}, r32 = ${sig6(s.levels[2].size.h / s.levels[1].size.h)}`, '');
  let probe = '';
  for (const q of s.quantities) {
    if (q.probe !== probe) { probe = q.probe; lines.push(`${q.probeLabel} [${q.probe}]`); }
    if (!q.result) { lines.push(`  ${q.label || '(probe)'}: ${q.missing}`); continue; }
    const u = unitLabel(q.unit), r = q.result;
    lines.push(`  ${q.label}${u ? ` [${u}]` : ''}: fine ${sig6(q.phi[0]!)}, medium ${sig6(q.phi[1]!)}, coarse ${sig6(q.phi[2]!)} — ${r.kind}`);
    if (r.kind === 'monotonic') {
      lines.push(`      apparent order p = ${sig6(r.order!)}, extrapolated ${sig6(r.extrapolated!)}, e_a = ${pct(r.approxRelError)}, e_ext = ${pct(r.extrapRelError)}, GCI_fine = ${pct(r.gciFine)}`);
    }
    for (const n of r.notes) lines.push(`      ${n}`);
  }
  return lines;
}
