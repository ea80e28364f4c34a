/**
 * The decaying vortex cell sample series against the exact unsteady Navier–Stokes solution of Taylor &
 * Green (1937, Proc. R. Soc. Lond. A 158, 499–521), 2D decaying form:
 *   u = U sin kx cos ky e^{−2νk²t}, v = −U cos kx sin ky e^{−2νk²t}, p = (ρU²/4)(cos 2kx + cos 2ky) e^{−4νk²t}.
 *  1. the closed form satisfies continuity and the momentum equations (finite-difference residual);
 *  2. the committed series (.pvd with uneven steps; numbered files with TimeValue) read as series give the
 *     same history, with the time source stated;
 *  3. point histories, a cut-plane flow rate, a line mean and a wall pressure force against the exact
 *     values, and their decay rates against 2νk² and 4νk² (the mesh's interpolation error is the same
 *     factor at every step, so the decay ratios are exact to rounding).
 */
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { nodeSeriesFiles, openSeriesInput } from '../../src/cli/seriesInputs.ts';
import { readProbeSetFile } from '../../src/cli/studyInputs.ts';
import { VORTEX_DEFAULTS as O, VORTEX_TIMES, exactPressure, exactVelocity, velocityDecayRate, wavenumber } from '../../src/samples/taylorGreen.ts';
import { evaluateSeries } from '../../src/series/evaluateSeries.ts';
import type { HistoryTable } from '../../src/series/historyTable.ts';

const REPO = resolve(__dirname, '../..');
const PVD = join(REPO, 'sample-fields/vortex-cell/cells.pvd');
const NUMBERED = join(REPO, 'sample-fields/vortex-cell-numbered');
const PROBES = join(REPO, 'examples/vortex-cell.probes.json');
const k = wavenumber(O), rate = velocityDecayRate(O);

const col = (t: HistoryTable, name: string): Float64Array => {
  const c = t.columns.find((x) => x.name === name);
  if (!c) throw new Error(`no column ${name} (have ${t.columns.map((x) => x.name).join(', ')})`);
  return c.values;
};

describe('the exact solution', () => {
  it('satisfies continuity and the Navier–Stokes momentum equations', () => {
    const h = 1e-6 * O.side, dt = 1e-4, nu = O.nu, rho = O.rho;
    for (const [x, y, t] of [[0.0013, 0.0071, 0.2], [0.0042, 0.0009, 1.1], [0.008, 0.0055, 0]] as const) {
      const u = (xx: number, yy: number, tt: number) => exactVelocity(O, xx, yy, tt);
      const p = (xx: number, yy: number) => exactPressure(O, xx, yy, t);
      const d = (f: (s: number) => number) => (f(h) - f(-h)) / (2 * h);
      const d2 = (f: (s: number) => number) => (f(h) - 2 * f(0) + f(-h)) / (h * h);
      const [u0, v0] = u(x, y, t);
      const div = d((s) => u(x + s, y, t)[0]) + d((s) => u(x, y + s, t)[1]);
      expect(Math.abs(div)).toBeLessThan(1e-6 * O.speed * k);
      for (const c of [0, 1] as const) {
        const dudt = (u(x, y, t + dt)[c] - u(x, y, t - dt)[c]) / (2 * dt);
        const conv = u0 * d((s) => u(x + s, y, t)[c]) + v0 * d((s) => u(x, y + s, t)[c]);
        const grad = c === 0 ? d((s) => p(x + s, y)) : d((s) => p(x, y + s));
        const lap = d2((s) => u(x + s, y, t)[c]) + d2((s) => u(x, y + s, t)[c]);
        const residual = dudt + conv + grad / rho - nu * lap;
        // scale of the terms: U²k (convection)
        expect(Math.abs(residual)).toBeLessThan(1e-5 * O.speed ** 2 * k);
      }
    }
  });
});

describe('the vortex cell series', () => {
  it('reads the .pvd (times from the collection) and the numbered files (times from TimeValue) alike', async () => {
    const set = (await readProbeSetFile(PROBES)).set;
    const a = await evaluateSeries(await openSeriesInput([PVD]), nodeSeriesFiles, set);
    const b = await evaluateSeries(await openSeriesInput([NUMBERED]), nodeSeriesFiles, set);
    expect(a.timeSource).toBe('collection');
    expect(b.timeSource).toBe('field-data');
    expect(Array.from(a.time)).toEqual([...VORTEX_TIMES]);
    expect(Array.from(b.time)).toEqual([...VORTEX_TIMES]);
    expect(b.stepNames[0]).toBe('cells_0001.vtu');
    expect(a.columns.map((c) => c.name)).toEqual(b.columns.map((c) => c.name));
    for (let i = 0; i < a.columns.length; i++) expect(Array.from(b.columns[i]!.values)).toEqual(Array.from(a.columns[i]!.values));
    expect(a.meshReuse).toEqual({ steps: 8, reused: 7 });
    expect(a.failures).toEqual([]);
  });

  it('matches the exact point values, flow rate, line mean and wall force, and their decay rates', async () => {
    const set = (await readProbeSetFile(PROBES)).set;
    const t = await evaluateSeries(await openSeriesInput([PVD]), nodeSeriesFiles, set);
    const times = Array.from(t.time);
    const L = O.side, H = O.thickness, U = O.speed, q = 0.25 * O.rho * U * U;
    const decayV = times.map((s) => Math.exp(-rate * s)), decayP = times.map((s) => Math.exp(-2 * rate * s));

    // a probe on a mesh node: interpolation returns the nodal (exact) value
    const ux = col(t, 'node.velocity_x [m/s]'), pNode = col(t, 'node.p [Pa]');
    times.forEach((s, i) => {
      expect(ux[i]).toBeCloseTo(exactVelocity(O, L / 8, L / 8, s)[0], 15);
      expect(pNode[i]).toBeCloseTo(exactPressure(O, L / 8, L / 8, s), 14);
    });

    // between nodes: trilinear interpolation of sin·cos on 16 cells a period — within 2 % of U (error ~ (kh)²/8)
    const bx = col(t, 'between.velocity_x [m/s]'), by = col(t, 'between.velocity_y [m/s]');
    times.forEach((s, i) => {
      const e = exactVelocity(O, 0.003, 0.0015, s);
      expect(Math.abs(bx[i]! - e[0])).toBeLessThan(0.02 * U * decayV[i]!);
      expect(Math.abs(by[i]! - e[1])).toBeLessThan(0.02 * U * decayV[i]!);
      // decay: the same spatial factor at every step, so the ratio is exactly e^{−2νk²t}
      expect(bx[i]! / bx[0]!).toBeCloseTo(decayV[i]!, 12);
    });

    // flow rate through x = L/4, 0 ≤ y ≤ L/4: Q = U H ∫cos ky dy = U H / k · e^{−2νk²t};
    // the piecewise-linear cut integrates cos by the trapezoid rule on 4 intervals: relative error (kh)²/12 ≈ 1.3 %
    const Q = col(t, 'quarter.volumeFlowRate [m³/s]');
    const h = L / O.cells;
    let trap = 0;
    for (let j = 0; j <= 4; j++) trap += (j === 0 || j === 4 ? 0.5 : 1) * Math.cos(k * j * h) * h;
    times.forEach((_s, i) => {
      expect(Q[i]! / ((U * H / k) * decayV[i]!)).toBeCloseTo(1, 1);
      expect(Math.abs(Q[i]! / ((U * H / k) * decayV[i]!) - 1)).toBeLessThan(0.014);
      expect(Q[i]).toBeCloseTo(U * H * trap * decayV[i]!, 17);
      expect(Q[i]! / Q[0]!).toBeCloseTo(decayV[i]!, 12);
    });

    // pressure force of the fluid on the side x = 0 (outward normal −x): F_x = −∫p dA = −(ρU²/4)·L·H·e^{−4νk²t}
    // (∫(1 + cos 2ky) dy over a period = L; the face rule is exact for it on a uniform period)
    const F = col(t, 'side.force.x [N]');
    times.forEach((_s, i) => expect(F[i]! / (-q * L * H * decayP[i]!)).toBeCloseTo(1, 12));

    // mean pressure along x = L/4: (ρU²/4)(cos π + mean of cos 2ky) = −ρU²/4 · e^{−4νk²t}; within 1 %
    const pm = col(t, 'traverse.p.mean [Pa]');
    times.forEach((_s, i) => {
      expect(Math.abs(pm[i]! / (-q * decayP[i]!) - 1)).toBeLessThan(0.01);
      expect(pm[i]! / pm[0]!).toBeCloseTo(decayP[i]!, 12);
    });

    // decay rates fitted from the histories (log-linear least squares) against 2νk² and 4νk²
    const slope = (v: Float64Array) => {
      const xs = times, ys = Array.from(v, (x) => Math.log(Math.abs(x)));
      const mx = xs.reduce((a, b) => a + b, 0) / xs.length, my = ys.reduce((a, b) => a + b, 0) / ys.length;
      let sxy = 0, sxx = 0;
      xs.forEach((x, i) => { sxy += (x - mx) * (ys[i]! - my); sxx += (x - mx) ** 2; });
      return -sxy / sxx;
    };
    expect(slope(Q) / rate).toBeCloseTo(1, 10);
    expect(slope(F) / (2 * rate)).toBeCloseTo(1, 10);
  });
});
