export { toObj, toStl } from './mesh-formats'
export { figuresToCsv } from './figures-csv'
export { toSurfaceResult, surfaceResultToJson } from './surface-result'
