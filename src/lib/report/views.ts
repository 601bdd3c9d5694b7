/**
 * The report's three views as SVG shapes: a shaded three-quarter view, a plan with height contours,
 * labelled frame points and numbered pins, and a flat-area map by slope class. Pure functions of the
 * surface (vertices #V×3 m, triangles #T×3), the frame and the pins.
 */
import {
  contourInterval,
  contourLevels,
  contourSegments,
  shortPointNames,
  type ReportFrame,
} from '../../../shared/report'
import type { SurfaceMesh } from '../../../shared/protocol'
import { FLAT_CLASSES, HEIGHT_RAMP, hexToRgb, rampColour } from '../colour-maps'
import { loopPointLabels, spreadLabels, spreadPins, type PointLabel } from './labels'
import {
  backToFront,
  faceShades,
  faceSlopeAngles,
  planTransform,
  projectVertices,
  scaleBarLength,
  viewAxes,
} from './projection'

export interface SvgFace {
  d: string
  fill: string
}
export interface SvgLabel {
  x: number
  y: number
  text: string
  anchor: 'start' | 'middle' | 'end'
}

const f1 = (v: number): string => v.toFixed(1)
const hex = ([r, g, b]: readonly number[]): string =>
  '#' +
  [r!, g!, b!]
    .map((c) =>
      Math.round(Math.min(1, Math.max(0, c)) * 255)
        .toString(16)
        .padStart(2, '0'),
    )
    .join('')
const SAND = hexToRgb('#d8bf94')

function triPath(p: (i: number) => [number, number], T: ArrayLike<number>, t: number): string {
  const [ax, ay] = p(T[3 * t]!),
    [bx, by] = p(T[3 * t + 1]!),
    [cx, cy] = p(T[3 * t + 2]!)
  return `M${f1(ax)} ${f1(ay)}L${f1(bx)} ${f1(by)}L${f1(cx)} ${f1(cy)}Z`
}

/** Short labels of the frame points by loop: "P3" on the outer loop, "H1 P3" on hole 1. */
function loopLabels(frame: ReportFrame): { points: { x: number; y: number; z: number }[]; texts: string[] }[] {
  const names = shortPointNames(frame.loops)
  return frame.loops.map((loop, l) => ({ points: loop.points, texts: names[l]! }))
}

/** Frame point labels on a drawing, given where a point in metres lands on it. */
function frameLabels(frame: ReportFrame, at: (x: number, y: number, z: number) => [number, number]): PointLabel[] {
  return loopLabels(frame).flatMap(({ points, texts }) => {
    const xy = points.map((p) => at(p.x, p.y, p.z))
    return loopPointLabels(
      xy.map((q) => q[0]),
      xy.map((q) => q[1]),
      texts,
    )
  })
}

/** Boundary edges of the mesh (used by one triangle) as one SVG path. */
function outlinePath(p: (i: number) => [number, number], T: ArrayLike<number>): string {
  const count = new Map<string, [number, number, number]>()
  for (let t = 0; t + 2 < T.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const a = T[t + k]!,
        b = T[t + ((k + 1) % 3)]!
      const key = a < b ? `${a}/${b}` : `${b}/${a}`
      const seen = count.get(key)
      count.set(key, seen ? [a, b, seen[2] + 1] : [a, b, 1])
    }
  }
  let d = ''
  for (const [a, b, n] of count.values())
    if (n === 1) d += `M${f1(p(a)[0])} ${f1(p(a)[1])}L${f1(p(b)[0])} ${f1(p(b)[1])}`
  return d
}

/** Three-quarter view from the south-west, 30° above the horizon, shaded by a light over the viewer's left shoulder. */
export function shadedView(s: SurfaceMesh, frame: ReportFrame, width: number, maxHeight: number) {
  const axes = viewAxes(225, 30)
  const P = projectVertices(s.vertices, axes)
  // Fit the projection like a plan: screen right/up play the part of x/y.
  const fit = planTransform(P, width, maxHeight, 28)
  const p = (i: number): [number, number] => [fit.x(P[3 * i]!), fit.y(P[3 * i + 1]!)]
  const light = [0, 1, 2].map((k) => -0.45 * axes.right[k]! + 0.55 * axes.up[k]! + 0.7 * axes.towards[k]!)
  const norm = Math.hypot(...light)
  const shades = faceShades(
    s.vertices,
    s.triangles,
    light.map((c) => c / norm),
  )
  const faces: SvgFace[] = [...backToFront(P, s.triangles)].map((t) => ({
    d: triPath(p, s.triangles, t),
    fill: hex(SAND.map((c) => c * shades[t]!)),
  }))
  const labels = frameLabels(frame, (x, y, z) => [
    fit.x(axes.right[0] * x + axes.right[1] * y),
    fit.y(axes.up[0] * x + axes.up[1] * y + axes.up[2] * z),
  ])
  // One path for every mesh line: faint, so the facets read as a surface rather than a silhouette.
  return {
    width,
    height: fit.height,
    faces,
    meshLines: faces.map((f) => f.d).join(''),
    outline: outlinePath(p, s.triangles),
    points: labels,
  }
}

/** Plan, north up: pale height tint, contours at a round interval with their heights, frame points, pins. */
export function planView(
  s: SurfaceMesh,
  frame: ReportFrame,
  pins: readonly { x: number; y: number }[],
  width: number,
  maxHeight: number,
) {
  const fit = planTransform(s.vertices, width, maxHeight, 36)
  const p = (i: number): [number, number] => [fit.x(s.vertices[3 * i]!), fit.y(s.vertices[3 * i + 1]!)]
  let zMin = Infinity,
    zMax = -Infinity
  for (let i = 2; i < s.vertices.length; i += 3) {
    zMin = Math.min(zMin, s.vertices[i]!)
    zMax = Math.max(zMax, s.vertices[i]!)
  }
  const faces: SvgFace[] = []
  for (let t = 0; 3 * t + 2 < s.triangles.length; t++) {
    const z =
      (s.vertices[3 * s.triangles[3 * t]! + 2]! +
        s.vertices[3 * s.triangles[3 * t + 1]! + 2]! +
        s.vertices[3 * s.triangles[3 * t + 2]! + 2]!) /
      3
    const c = rampColour(HEIGHT_RAMP, zMax > zMin ? (z - zMin) / (zMax - zMin) : 0.5)
    faces.push({ d: triPath(p, s.triangles, t), fill: hex(c.map((v) => 0.45 * v + 0.55)) })
  }
  const points = frameLabels(frame, (x, y) => [fit.x(x), fit.y(y)])
  const pinMarks = spreadPins(pins.map((q) => [fit.x(q.x), fit.y(q.y)]))
  const interval = contourInterval(zMin, zMax)
  const levels = interval ? contourLevels(zMin, zMax, interval) : []
  const candidates: [number, number][][] = []
  const contours = levels.map((level) => {
    const seg = contourSegments(s.vertices, s.triangles, level)
    let d = ''
    const mids: [number, number][] = []
    for (let i = 0; i < seg.length; i += 4) {
      const [ax, ay, bx, by] = [fit.x(seg[i]!), fit.y(seg[i + 1]!), fit.x(seg[i + 2]!), fit.y(seg[i + 3]!)]
      d += `M${f1(ax)} ${f1(ay)}L${f1(bx)} ${f1(by)}`
      mids.push([(ax + bx) / 2, (ay + by) / 2])
    }
    candidates.push(mids)
    return { level, d }
  })
  const taken: [number, number][] = [
    ...points.flatMap(
      (p) =>
        [
          [p.x, p.y],
          [p.label.x, p.label.y],
        ] as [number, number][],
    ),
    ...pinMarks.map((p) => [p.x, p.y] as [number, number]),
  ]
  const places = spreadLabels(candidates, taken)
  const digits = interval !== null && interval < 0.1 ? 2 : interval !== null && interval < 1 ? 2 : 1
  const contourLabels = levels.flatMap((level, i) => {
    const at = places[i]
    return at ? [{ x: at[0], y: at[1] + 3, text: level.toFixed(digits), anchor: 'middle' as const }] : []
  })
  const bar = scaleBarLength((fit.width - 72) / fit.scale)
  // The scale bar sits in a strip below the drawing, clear of the frame point labels.
  return {
    width,
    height: fit.height + 18,
    faces,
    contours,
    contourLabels,
    interval,
    outline: outlinePath(p, s.triangles),
    points,
    pins: pinMarks,
    scaleBar: { metres: bar, length: bar * fit.scale },
  }
}

/** Flat-area map: each face coloured by its slope class; the classes with their share of fabric area. */
export function slopeMapView(
  s: SurfaceMesh,
  frame: ReportFrame,
  flatThreshold: number,
  width: number,
  maxHeight: number,
) {
  const fit = planTransform(s.vertices, width, maxHeight, 24)
  const p = (i: number): [number, number] => [fit.x(s.vertices[3 * i]!), fit.y(s.vertices[3 * i + 1]!)]
  const slopes = faceSlopeAngles(s.vertices, s.triangles)
  const V = s.vertices,
    T = s.triangles
  const shares = [0, 0, 0]
  const faces: SvgFace[] = []
  for (let t = 0; t < slopes.length; t++) {
    const a = 3 * T[3 * t]!,
      b = 3 * T[3 * t + 1]!,
      c = 3 * T[3 * t + 2]!
    const u = [V[b]! - V[a]!, V[b + 1]! - V[a + 1]!, V[b + 2]! - V[a + 2]!],
      w = [V[c]! - V[a]!, V[c + 1]! - V[a + 1]!, V[c + 2]! - V[a + 2]!]
    const area =
      0.5 * Math.hypot(u[1]! * w[2]! - u[2]! * w[1]!, u[2]! * w[0]! - u[0]! * w[2]!, u[0]! * w[1]! - u[1]! * w[0]!)
    const k = slopes[t]! < flatThreshold ? 0 : slopes[t]! < 2 * flatThreshold ? 1 : 2
    shares[k]! += area
    faces.push({ d: triPath(p, T, t), fill: FLAT_CLASSES[k].hex })
  }
  const total = shares[0]! + shares[1]! + shares[2]! || 1
  const t = flatThreshold
  const classes = [
    {
      hex: FLAT_CLASSES[0].hex,
      range: `under ${t}°`,
      label: 'flat: ponding and flutter risk',
      share: shares[0]! / total,
    },
    { hex: FLAT_CLASSES[1].hex, range: `${t}–${2 * t}°`, label: 'shallow: check drainage', share: shares[1]! / total },
    {
      hex: FLAT_CLASSES[2].hex,
      range: `${2 * t}° and steeper`,
      label: 'steeper in the prestress state (not checked under load)',
      share: shares[2]! / total,
    },
  ]
  const points = frame.loops.flatMap((l) => l.points.map((q) => ({ x: fit.x(q.x), y: fit.y(q.y) })))
  return { width, height: fit.height, faces, outline: outlinePath(p, T), points, classes }
}
