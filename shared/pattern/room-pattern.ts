/**
 * The pattern job of a room, as one pure function (the solve worker calls it after a settled
 * solve; any job runner could): families → cuts → computePattern → a payload with typed arrays
 * for the live stream. A refused cut comes back as a named error, never thrown.
 */
import { cutsForSurface, type RoomCuts } from './families'
import { computePattern } from './pattern'
import { PatternError } from './pattern-error'
import type { PatternResult } from './types'

export interface RoomPatternPayload {
  /** null when the cut was refused (then `error` says why). */
  result: PatternResult | null
  error: { code: string; field: string; message: string } | null
  /** The settings used, seams expanded (for the downloads and the cutting sheet). */
  settings: {
    warpAngle: number
    compensation: { warp: number; fill: number }
    seamAllowance: number
    rollWidth: number
  }
  /**
   * All strips' flat meshes in three arrays (socket.io allows only a few binary attachments per
   * message): strip k owns vertices vertexStart[k]…vertexStart[k+1]−1 of uv (#n×2, m,
   * compensated) and triangles triangleStart[k]…triangleStart[k+1]−1 (#t×3, indices local to the
   * strip) with their warp and fill strain (#t×2). Strips in result order.
   */
  flat: {
    uv: Float32Array
    triangles: Uint32Array
    strain: Float32Array
    vertexStart: number[]
    triangleStart: number[]
  }
  /** The surface as cut (#V'×3 m, #T'×3) and each of its triangles' strip (index into result.strips). */
  cutVertices: Float32Array
  cutTriangles: Uint32Array
  triangleStrip: Uint32Array
  /** Seams beyond the limit that were left out. */
  dropped: number
  ms: number
}

/** signal: checked between strips and iterations; a cancelled job throws PatternError('cancelled'). */
export function roomPattern(
  vertices: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  cuts: Readonly<RoomCuts>,
  signal?: { readonly aborted: boolean },
): RoomPatternPayload {
  const started = globalThis.performance.now()
  const { settings, dropped, familyOfSeam } = cutsForSurface(cuts, vertices)
  const base = { settings: cuts.settings, dropped }
  try {
    const { result, detail } = computePattern(
      { vertices: Float64Array.from(vertices), triangles: Uint32Array.from(triangles) },
      settings,
      { signal },
    )
    return {
      ...base,
      result,
      error: null,
      flat: packFlat(detail.flat),
      cutVertices: Float32Array.from(detail.cutSurface.vertices),
      cutTriangles: detail.cutSurface.triangles,
      triangleStrip: Uint32Array.from(detail.triangleStrip),
      ms: globalThis.performance.now() - started,
    }
  } catch (err) {
    if (!(err instanceof PatternError) || err.code === 'cancelled') throw err
    // name the family the refused seam came from (people edit families, not single planes)
    const seam = /^seams\[(\d+)\]/.exec(err.field)
    const field = seam ? `families[${familyOfSeam[Number(seam[1])]}]` : err.field
    return {
      ...noRoomPattern({ code: err.code, field: `pattern.${field}`, message: err.reason }, cuts.settings),
      dropped,
    }
  }
}

/** A payload without strips: the seams were refused (`error`) or removed (error null). */
export function noRoomPattern(
  error: RoomPatternPayload['error'],
  settings: RoomPatternPayload['settings'] = {
    warpAngle: 0,
    compensation: { warp: 0, fill: 0 },
    seamAllowance: 0,
    rollWidth: 0,
  },
): RoomPatternPayload {
  const flat = packFlat([])
  const cut = { cutVertices: new Float32Array(0), cutTriangles: new Uint32Array(0), triangleStrip: new Uint32Array(0) }
  return { result: null, error, settings, flat, ...cut, dropped: 0, ms: 0 }
}

/** One set of arrays for all strips, with where each strip starts. */
function packFlat(
  strips: readonly { uv: Float64Array; triangles: Uint32Array; strain: Float64Array }[],
): RoomPatternPayload['flat'] {
  const vertexStart = [0],
    triangleStart = [0]
  for (const s of strips) {
    vertexStart.push(vertexStart.at(-1)! + s.uv.length / 2)
    triangleStart.push(triangleStart.at(-1)! + s.triangles.length / 3)
  }
  const uv = new Float32Array(2 * vertexStart.at(-1)!)
  const triangles = new Uint32Array(3 * triangleStart.at(-1)!)
  const strain = new Float32Array(2 * triangleStart.at(-1)!)
  strips.forEach((s, k) => {
    uv.set(s.uv, 2 * vertexStart[k]!)
    triangles.set(s.triangles, 3 * triangleStart[k]!)
    strain.set(s.strain, 2 * triangleStart[k]!)
  })
  return { uv, triangles, strain, vertexStart, triangleStart }
}
