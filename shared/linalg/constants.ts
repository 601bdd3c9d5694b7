/**
 * The one shared tolerance of Veilroom's numerical code (linalg, mesh, solver, figures).
 * Dimensionless: used relative to a scale (a pivot against the largest diagonal entry, an area
 * against the mean face area), never as an absolute length.
 */
export const EPSILON = 1e-12
