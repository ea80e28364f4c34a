/** Tolerances of the quadratic gradient fit (quadraticGradient.ts, pairedFit.ts). */

/** Relative pivot below which an unknown is dropped from the fit. */
export const PIVOT_TOLERANCE = 1e-9;
/**
 * Relative pivot below which the one-ring is refitted over the two-ring: a node on a boundary face sees
 * only two layers of nodes across it, too few to tell a curvature across the face from a slope.
 */
export const WIDEN_TOLERANCE = 1e-3;
/**
 * Offset of a one-ring's mean from its site, relative to the ring's RMS distance, above which the ring
 * counts as one-sided (a node on the boundary) and the two-ring is used: its curvature across the
 * boundary is otherwise resolved from the small scatter of one layer of nodes.
 */
export const ONE_SIDED = 0.2;
/** What `fit` returns for a one-sided ring it was told to skip (below WIDEN_TOLERANCE, so the caller widens). */
export const SKEWED = -2;
