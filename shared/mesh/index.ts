export { meshFrame } from './mesh-frame'
export { MeshError } from './mesh-error'
export * from './quantities'
export { EPSILON } from './constants'
