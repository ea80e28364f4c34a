/**
 * Results built from several surfaces: the pressure loss between two cut-planes with its loss coefficient,
 * and the mass balance over a set of planes and/or boundary-surface groups.
 *
 * Pressure loss (plane 1 upstream, plane 2 downstream; means are mass-flow-weighted, so they do not depend on
 * the sign of either normal): Δp₀ = p̄₀,₁ − p̄₀,₂ (positive when total pressure is lost), static drops
 * Δp = p̄₁ − p̄₂ (mass-flow- and area-weighted), K = Δp₀ / (½ρV²) with V = |Q|/A on the chosen reference
 * plane and ρ the constant density, or the bulk density ṁ/Q of that plane when density is a field. For a
 * kinematic pressure field (p/ρ) the loss is Δ(p₀/ρ) and K = Δ(p₀/ρ) / (½V²).
 *
 * Mass balance: each surface's normal must point out of the control volume. Per surface, outflow is the
 * flux through the parts with ρu·n > 0 and inflow the flux through the parts with ρu·n < 0 (exact split,
 * see `integrals.ts`). Net = Σ ṁ (zero for a balanced volume), imbalance share = net / total inflow.
 */
import type { SurfaceIntegrals } from './integrals.ts';

/** Options of `pressureLoss`. */
export interface LossOptions {
  /** Plane whose mean velocity (and density) define ½ρV². Default 'upstream'. */
  reference: 'upstream' | 'downstream';
}

export interface PressureLoss {
  /** Mass-flow-weighted total-pressure loss p̄₀,₁ − p̄₀,₂ (Pa, or m²/s² when kinematic), or null. */
  totalPressureLoss: number | null;
  /** Static-pressure drop p̄₁ − p̄₂, both weightings. */
  staticPressureDrop: { massFlowWeighted: number | null; areaWeighted: number } | null;
  reference: 'upstream' | 'downstream';
  /** V = |Q|/A on the reference plane (m/s). */
  meanVelocity: number | null;
  /** Density used in ½ρV² (null when kinematic). */
  density: number | null;
  /** ½ρV² (or ½V² when kinematic). */
  dynamicPressure: number | null;
  /** K = Δp₀ / (½ρV²). */
  lossCoefficient: number | null;
  kinematic: boolean;
  notes: string[];
}

/** Pressure loss from plane 1 (upstream) to plane 2 (downstream) from their integrals. */
export function pressureLoss(up: SurfaceIntegrals, down: SurfaceIntegrals, options: Partial<LossOptions> = {}): PressureLoss {
  const reference = options.reference ?? 'upstream';
  const notes: string[] = [];
  const ref = reference === 'upstream' ? up : down;
  const kinematic = up.totalPressure?.kinematic ?? up.staticPressure?.kinematic ?? false;
  const out: PressureLoss = {
    totalPressureLoss: null, staticPressureDrop: null, reference, meanVelocity: null, density: null,
    dynamicPressure: null, lossCoefficient: null, kinematic, notes,
  };
  if (up.empty || down.empty) { notes.push(`${up.empty ? 'upstream' : 'downstream'} plane is empty: ${(up.empty ? up : down).reason}`); return out; }
  if ((down.totalPressure?.kinematic ?? kinematic) !== kinematic) throw new Error('loss: both planes must use the same pressure form (kinematic or not)');
  const p01 = up.totalPressure?.massFlowMean ?? null, p02 = down.totalPressure?.massFlowMean ?? null;
  if (p01 !== null && p02 !== null) out.totalPressureLoss = p01 - p02;
  else notes.push('total pressure needs velocity, pressure and density (or kinematic pressure) with a non-zero mass flow on both planes');
  if (up.staticPressure && down.staticPressure) {
    const m1 = up.staticPressure.massFlowMean, m2 = down.staticPressure.massFlowMean;
    out.staticPressureDrop = { massFlowWeighted: m1 !== null && m2 !== null ? m1 - m2 : null, areaWeighted: up.staticPressure.areaMean - down.staticPressure.areaMean };
  }
  if (ref.volumeFlowRate !== null && ref.area) {
    const V = Math.abs(ref.volumeFlowRate) / ref.area;
    out.meanVelocity = V;
    let rho: number | null = null;
    if (!kinematic) {
      if (typeof ref.roles.density === 'number') rho = ref.roles.density;
      else if (ref.massFlowRate !== null && ref.volumeFlowRate !== 0) { rho = ref.massFlowRate / ref.volumeFlowRate; notes.push('density is a field: ½ρV² uses the bulk density ṁ/Q of the reference plane'); }
    }
    out.density = rho;
    const q = kinematic ? 0.5 * V * V : rho !== null ? 0.5 * rho * V * V : null;
    out.dynamicPressure = q;
    if (q !== null && q > 0 && out.totalPressureLoss !== null) out.lossCoefficient = out.totalPressureLoss / q;
  }
  // 1 % mismatch: common practice, not a published threshold (docs/references.md, rules of thumb)
  const m1 = up.massFlowRate, m2 = down.massFlowRate;
  if (m1 !== null && m2 !== null && Math.abs(Math.abs(m1) - Math.abs(m2)) > 0.01 * Math.max(Math.abs(m1), Math.abs(m2))) {
    notes.push(`mass-flow rates differ by more than 1 % between the planes (${m1.toPrecision(5)} vs ${m2.toPrecision(5)}): check that both cut the same stream`);
  }
  return out;
}

/** One surface of a mass balance: its integrals, with the normal pointing out of the control volume. */
export interface BalanceItem {
  label: string;
  integrals: SurfaceIntegrals;
}

export interface MassBalance {
  /** 'mass' (kg/s) when every surface has a mass-flow rate, else 'volume' (m³/s). */
  basis: 'mass' | 'volume';
  /** Σ flux, outward positive. */
  net: number | null;
  /** Σ inflow (positive number). */
  inflow: number | null;
  /** Σ outflow (positive number). */
  outflow: number | null;
  /** net / inflow. */
  imbalanceShare: number | null;
  items: { label: string; flux: number | null; inflow: number | null; outflow: number | null; empty: boolean }[];
  notes: string[];
}

/** Mass (or volume) balance over surfaces whose normals point out of the control volume. */
export function massBalance(items: readonly BalanceItem[]): MassBalance {
  const notes: string[] = [];
  const basis: 'mass' | 'volume' = items.every((i) => i.integrals.empty || i.integrals.massFlowRate !== null) ? 'mass' : 'volume';
  if (basis === 'volume') notes.push('no density on every surface: the balance is of volume flow');
  let net = 0, inflow = 0, outflow = 0, ok = items.length > 0;
  const rows = items.map(({ label, integrals: s }) => {
    const flux = basis === 'mass' ? s.massFlowRate : s.volumeFlowRate;
    const neg = basis === 'mass' ? s.reverseFlow?.massFlowRate ?? null : s.reverseFlow?.volumeFlowRate ?? null;
    if (s.empty || flux === null || neg === null) {
      ok = false;
      notes.push(`${label}: ${s.empty ? `empty (${s.reason})` : 'no velocity field'}`);
      return { label, flux: null, inflow: null, outflow: null, empty: s.empty };
    }
    net += flux; inflow += -neg; outflow += flux - neg;
    return { label, flux, inflow: -neg, outflow: flux - neg, empty: false };
  });
  if (!ok) return { basis, net: null, inflow: null, outflow: null, imbalanceShare: null, items: rows, notes };
  return { basis, net, inflow, outflow, imbalanceShare: inflow > 0 ? net / inflow : null, items: rows, notes };
}
