/**
 * The engine as the live room uses it, in one place: mesh-size estimates on the main thread and the
 * stateful surface solver with figures (shared/engine, shared/figures) in the workers. Frames are
 * read and validated on the main thread by shared/room-doc/read.ts.
 */
export { estimatedVertices, frameMeshedArea } from '../../shared/frame/index.js'
export { frameStructureKey } from '../../shared/solver/index.js'
export { createSurfaceSolver, type SurfaceSolver } from '../../shared/engine.js'
export { computeFigures } from '../../shared/figures/index.js'
