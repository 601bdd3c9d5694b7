export { computeFigures, DEFAULT_FLAT_THRESHOLD, type FigureOptions } from './compute-figures'
export { faceSlopes, slopeHistogram, flatAreaShare } from './slopes'
export { pondingPockets, type PondingPocket } from './ponding'
export { cableFigures, frameReactions, edgeVertices } from './boundary-forces'
