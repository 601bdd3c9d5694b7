export { computePattern, type PatternDetail, type PatternOptions } from './pattern'
export {
  parseCutSettings,
  parseCutsFile,
  parseSurfaceFile,
  cutSettingsSchema,
  cutsFileSchema,
  seamSchema,
  MAX_SEAMS,
} from './schema'
export { PatternError, type PatternErrorCode } from './pattern-error'
export {
  PATTERN_CAUTION,
  type CutSettings,
  type GeodesicSeam,
  type PatternResult,
  type PlaneSeam,
  type Seam,
  type StripPattern,
  type StripSeam,
  type TriangleMesh,
} from './types'
export { cutsForSurface, roomCutsSchema, seamFamilySchema, type RoomCuts, type SeamFamily } from './families'
export { noRoomPattern, roomPattern, type RoomPatternPayload } from './room-pattern'
