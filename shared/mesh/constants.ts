/** The one shared tolerance lives in shared/linalg/constants.ts; re-exported for mesh code. */
export { EPSILON } from '../linalg/constants'
