export { EPSILON } from "./constants";
export {
  csrFromRows,
  csrSlot,
  csrMultiply,
  csrWithSamePattern,
  type SymmetricCsr,
} from "./csr";
export { trianglePattern, type TrianglePattern } from "./triangle-pattern";
export { expandPattern, type DofPattern } from "./dof-pattern";
export { minimumDegreeOrdering } from "./minimum-degree";
export {
  ldlSymbolic,
  ldlFactor,
  ldlSolve,
  NotPositiveDefiniteError,
  type LdlSymbolic,
  type LdlFactor,
} from "./ldl";
export {
  conjugateGradients,
  type PcgOptions,
  type PcgResult,
} from "./conjugate-gradients";
