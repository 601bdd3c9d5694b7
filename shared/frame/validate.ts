/**
 * Geometric and physical checks of a normalised Frame. Throws FrameError naming the field.
 *
 * Spatial rule: a hole must lie strictly inside the outer loop in plan, unless the two loops are
 * apart in height (their z ranges do not overlap), because then no 3D crossing can exist — e.g. two
 * coaxial rings one above the other (a catenoid). Such a frame must consist of exactly these two
 * loops; it is meshed with meshParametric and solved on the 3D path (frameNeedsSpatialSolve).
 */
import type { Frame } from '../types'
import { loopSignedArea, pointSegmentDistance, segmentsTouch } from '../mesh/plan-geometry'
import { FrameError } from './frame-error'
import { frameSpan, loopPlan, loopsApartInHeight, loopsTouch, loopStrictlyInside } from './loop-relations'
import { estimatedVertexCount } from '../mesh/lattice'
import { MAX_ESTIMATED_VERTICES, MAX_FRAME_POINTS } from './schema'

/** Throws the first problem found; returns the frame unchanged when it is valid. */
export function validateFrame(frame: Readonly<Frame>): Frame {
  const { loops } = frame
  const outers = loops.filter((l) => l.role === 'outer').length
  if (outers !== 1 || loops[0]?.role !== 'outer') {
    throw new FrameError('outer-loop-count', `needs exactly one outer loop, listed first (found ${outers})`, 'loops')
  }
  const total = loops.reduce((s, l) => s + l.points.length, 0)
  if (total > MAX_FRAME_POINTS) {
    throw new FrameError(
      'too-many-points',
      `has ${total} frame points; at most ${MAX_FRAME_POINTS} are allowed`,
      'loops',
    )
  }
  checkPhysics(frame)
  const tol = Math.max(frameSpan(loops), 1) * 1e-9
  const ids = new Set<string>()
  const plans = loops.map((loop, l) => {
    if (loop.points.length < 3) {
      throw new FrameError(
        'too-few-points',
        `has ${loop.points.length} points; a loop needs at least 3`,
        `loops[${l}].points`,
      )
    }
    loop.points.forEach((p, i) => {
      if (ids.has(p.id))
        throw new FrameError('duplicate-id', `id "${p.id}" is used twice`, `loops[${l}].points[${i}].id`)
      ids.add(p.id)
    })
    const xy = loopPlan(loop)
    checkLoopShape(xy, l, tol)
    return xy
  })
  const outer = plans[0]!
  for (let l = 1; l < loops.length; l++) {
    const hole = plans[l]!
    if (loopStrictlyInside(hole, outer, tol)) continue
    if (loopsApartInHeight(loops[l]!, loops[0]!, tol)) {
      if (loops.length !== 2) {
        throw new FrameError(
          'spatial-frame',
          'overlaps the outer loop in plan (rings one above the other); such a frame may have only these two loops',
          `loops[${l}]`,
        )
      }
      continue
    }
    const touch = loopsTouch(hole, outer, tol)
    if (touch) {
      throw new FrameError(
        'loops-crossing',
        `edge ${touch[0]} crosses or touches edge ${touch[1]} of the outer loop`,
        `loops[${l}].edges[${touch[0]}]`,
      )
    }
    throw new FrameError(
      'hole-outside',
      'lies outside the outer loop in plan (and the two loops overlap in height)',
      `loops[${l}]`,
    )
  }
  for (let a = 1; a < loops.length; a++) {
    for (let b = a + 1; b < loops.length; b++) {
      const touch = loopsTouch(plans[a]!, plans[b]!, tol)
      if (touch)
        throw new FrameError(
          'loops-crossing',
          `edge ${touch[0]} crosses or touches edge ${touch[1]} of loops[${b}]`,
          `loops[${a}].edges[${touch[0]}]`,
        )
      if (loopStrictlyInside(plans[a]!, plans[b]!, tol) || loopStrictlyInside(plans[b]!, plans[a]!, tol)) {
        throw new FrameError(
          'loops-crossing',
          `lies inside hole loops[${b}] (or contains it); holes must be side by side`,
          `loops[${a}]`,
        )
      }
    }
  }
  checkMeshSize(frame, plans)
  return frame as Frame
}

function checkPhysics(frame: Readonly<Frame>): void {
  if (!(frame.prestress.warp > 0))
    throw new FrameError('prestress', `must be > 0 kN/m (got ${frame.prestress.warp})`, 'prestress.warp')
  if (!(frame.prestress.fill > 0))
    throw new FrameError('prestress', `must be > 0 kN/m (got ${frame.prestress.fill})`, 'prestress.fill')
  if (!Number.isFinite(frame.prestress.warpAngle)) {
    throw new FrameError(
      'prestress',
      `must be an angle in degrees from +x (got ${frame.prestress.warpAngle})`,
      'prestress.warpAngle',
    )
  }
  if (!(frame.mesh.edgeLength > 0)) {
    throw new FrameError('edge-length', `must be > 0 m (got ${frame.mesh.edgeLength})`, 'mesh.edgeLength')
  }
  frame.loops.forEach((loop, l) =>
    loop.edges.forEach((e, i) => {
      if (e.kind !== 'cable') return
      if (e.tension === undefined)
        throw new FrameError('cable-tension', 'a cable edge needs a tension in kN', `loops[${l}].edges[${i}].tension`)
      if (!(e.tension > 0))
        throw new FrameError('cable-tension', `must be > 0 kN (got ${e.tension})`, `loops[${l}].edges[${i}].tension`)
    }),
  )
}

/** Repeated consecutive points, zero-area loops, edges crossing or folding back on each other. */
function checkLoopShape(xy: Float64Array, l: number, tol: number): void {
  const n = xy.length / 2
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n
    if (Math.hypot(xy[2 * j]! - xy[2 * i]!, xy[2 * j + 1]! - xy[2 * i + 1]!) <= tol) {
      throw new FrameError('repeated-point', `repeats point ${i} in plan (same x and y)`, `loops[${l}].points[${j}]`)
    }
  }
  for (let i = 0; i < n; i++) {
    const i2 = (i + 1) % n
    for (let j = i + 1; j < n; j++) {
      const j2 = (j + 1) % n
      const a = [xy[2 * i]!, xy[2 * i + 1]!, xy[2 * i2]!, xy[2 * i2 + 1]!] as const
      const b = [xy[2 * j]!, xy[2 * j + 1]!, xy[2 * j2]!, xy[2 * j2 + 1]!] as const
      let bad: boolean
      if (j === i2)
        bad =
          pointSegmentDistance(b[2], b[3], a[0], a[1], a[2], a[3]) <= tol ||
          pointSegmentDistance(a[0], a[1], b[0], b[1], b[2], b[3]) <= tol
      else if (j2 === i)
        bad =
          pointSegmentDistance(a[2], a[3], b[0], b[1], b[2], b[3]) <= tol ||
          pointSegmentDistance(b[0], b[1], a[0], a[1], a[2], a[3]) <= tol
      else bad = segmentsTouch(a[0], a[1], a[2], a[3], b[0], b[1], b[2], b[3], tol)
      if (bad)
        throw new FrameError(
          'self-crossing',
          `edge ${i} crosses or touches edge ${j} of the same loop`,
          `loops[${l}].edges[${i}]`,
        )
    }
  }
  if (Math.abs(loopSignedArea(xy)) <= tol * tol) {
    throw new FrameError('degenerate-loop', 'encloses no plan area (all points on a line)', `loops[${l}].points`)
  }
}

/**
 * The area the mesher fills, m²: the outer loop's plan area minus the holes', or for two rings one
 * above the other the lofted side (mean perimeter × gap between their centres).
 */
function meshedArea(frame: Readonly<Frame>, plans: readonly Float64Array[]): number {
  const h = frame.mesh.edgeLength
  let area = Math.abs(loopSignedArea(plans[0]!))
  const spatial = plans.length === 2 && !loopStrictlyInside(plans[1]!, plans[0]!, 0)
  if (spatial) {
    const perim = (loop: Readonly<Frame['loops'][number]>): number =>
      loop.points.reduce((s, p, i) => {
        const q = loop.points[(i + 1) % loop.points.length]!
        return s + Math.hypot(q.x - p.x, q.y - p.y, q.z - p.z)
      }, 0)
    const [a, b] = frame.loops as [Frame['loops'][number], Frame['loops'][number]]
    const mean = (loop: typeof a, k: 'x' | 'y' | 'z'): number =>
      loop.points.reduce((s, p) => s + p[k], 0) / loop.points.length
    const gap = Math.hypot(mean(a, 'x') - mean(b, 'x'), mean(a, 'y') - mean(b, 'y'), mean(a, 'z') - mean(b, 'z'))
    return ((perim(a) + perim(b)) / 2) * Math.max(gap, h)
  }
  for (let l = 1; l < plans.length; l++) area -= Math.abs(loopSignedArea(plans[l]!))
  return Math.max(area, 0)
}

/** Estimated vertex count of a valid frame's mesh (shared/mesh/lattice.ts estimatedVertexCount). */
export function estimatedVertices(frame: Readonly<Frame>): number {
  return estimatedVertexCount(meshedArea(frame, frame.loops.map(loopPlan)), frame.mesh.edgeLength)
}

/** The area (m²) the mesher fills for a valid frame. */
export const frameMeshedArea = (frame: Readonly<Frame>): number => meshedArea(frame, frame.loops.map(loopPlan))

/** Refuse meshes too fine for the engine: at most MAX_ESTIMATED_VERTICES estimated vertices. */
function checkMeshSize(frame: Readonly<Frame>, plans: readonly Float64Array[]): void {
  const estimate = estimatedVertexCount(meshedArea(frame, plans), frame.mesh.edgeLength)
  if (estimate > MAX_ESTIMATED_VERTICES) {
    throw new FrameError(
      'mesh-too-fine',
      `mesh too fine: about ${Math.round(estimate)} vertices at this edge length; at most ${MAX_ESTIMATED_VERTICES} (use a larger edgeLength)`,
      'mesh.edgeLength',
    )
  }
}
