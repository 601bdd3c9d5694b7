/** Relative tolerance for geometric predicates and degenerate-length checks (dimensionless). */
export const EPSILON = 1e-12
