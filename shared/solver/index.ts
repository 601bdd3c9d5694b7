export { solveHeightField, HEIGHT_FIELD_METHOD, type HeightFieldProblem, type HeightFieldResult } from './height-field'
export {
  solveSpatial,
  spatialSetup,
  SPATIAL_METHOD,
  type SpatialProblem,
  type SpatialResult,
  type SpatialSetup,
} from './spatial'
export { frameConstraints, isotropicPrestress, frameStructureKey, type FrameConstraints } from './frame-problem'
export { solveSpatialNewton, SPATIAL_NEWTON_METHOD, type NewtonProblem, type NewtonResult } from './spatial-newton'
export { solveSpatialPath, type SpatialPathResult } from './spatial-path'
export { membraneStress, stressDeviation, type WarpFibres, type StressDeviation } from './membrane-fibres'
export { SpdSystem } from './spd-system'
export type { SolveControl } from './control'
