/**
 * One call from a plane to its numbers: cut the dataset, select the region, integrate. This is the path the
 * command line and the worker use; each step is also available on its own (`cutPlane`, `selectRegion`,
 * `integrateSurface`).
 */
import type { Dataset } from '../model/dataset.ts';
import { cutPlane, type CutOptions, type PlaneCut } from './cutPlane.ts';
import { integrateSurface, type IntegralOptions, type SurfaceIntegrals } from './integrals.ts';
import { selectRegion, type Region, type RegionSpec } from './region.ts';
import type { Vec3 } from './triangleSet.ts';

/** A plane and what to do with it; only origin and normal are required. */
export interface PlaneQuery {
  /** A point of the plane (file's length unit). */
  origin: Vec3;
  /** Normal (any length); fluxes are positive along it. */
  normal: Vec3;
  /** Region filters (see `region.ts`); default: the whole cut. */
  region?: readonly RegionSpec[];
  integral?: Partial<IntegralOptions>;
  cut?: Partial<CutOptions>;
}

export interface PlaneResult {
  cut: PlaneCut;
  region: Region;
  integrals: SurfaceIntegrals;
}

/** Cuts, selects the region and integrates (units: the file's). An empty cut or region gives `integrals.empty`. */
export function integratePlane(dataset: Dataset, q: PlaneQuery): PlaneResult {
  return integrateCut(cutPlane(dataset, q.origin, q.normal, q.cut), q);
}

/** Selects `q`'s region of a cut already made and integrates over it (units: the file's). */
export function integrateCut(cut: PlaneCut, q: PlaneQuery): PlaneResult {
  const region = selectRegion(cut, q.region ?? []);
  const integrals = integrateSurface(region.set, q.integral, region.arcs ?? undefined);
  if (integrals.empty) {
    integrals.reason = cut.empty ? 'the plane misses every 3D cell of the mesh' : region.reason ?? integrals.reason;
  }
  return { cut, region, integrals };
}
