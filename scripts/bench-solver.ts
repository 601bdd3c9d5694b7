/**
 * Solver benchmark (`npm run bench`): meshing, cold solve, warm re-solve after one frame point moves
 * by 2 % of the span, and memory, at about 1k, 2k, 5k, 20k and 80k vertices. Prints a table and
 * writes bench-results/solver.json. Figures only: no assertions (timings depend on the machine).
 * Targets from the task: warm 20k ≤ 100 ms, cold 20k ≤ 400 ms, cold 2k ≤ 30 ms, memory linear.
 * Spatial rows (issue 9): the cable square at 5k/20k/80k, the deep-sag sail and a steep rigid
 * frame; every row prints its cold solve as a multiple of one numeric LDLᵀ factorisation of the
 * plan Laplacian on the same free vertices (our own ldl.ts, nested dissection), and cable rows as
 * a multiple of the height-field cold solve of the same plan mesh. BENCH_ONLY=a,b keeps the rows
 * whose path contains a or b; BENCH_MAX caps the vertex count; BENCH_RUNS (default 3) runs per row.
 */
import { mkdirSync, writeFileSync } from 'node:fs'
import { loadavg } from 'node:os'
import { createSurfaceSolver } from '../shared/engine'
import { frameConstraints } from '../shared/solver/frame-problem'
import { trianglePattern } from '../shared/linalg/triangle-pattern'
import { assembleCotanLaplacian, cornerCotanWeights } from '../shared/solver/cotan-laplacian'
import { rowCoordinates, SpdSystem } from '../shared/solver/spd-system'
import { meshFrame } from '../shared/mesh'
import type { MembraneMesh } from '../shared/types'
import type { Frame } from '../shared/types'
import { patternBench } from './bench-pattern'

const SPAN = 10

/** The same square with its first edge a cable (T = 60 kN): the spatial path. */
function cableFrame(edgeLength: number, lift = 0): Frame {
  const f = frame(edgeLength, lift)
  f.loops[0]!.edges[0] = { kind: 'cable', tension: 60 }
  return f
}

/** Deep-sag sail: 10 m hypar (corners 0/3 m), two opposite edges cables of 20 kN, σ = 3 kN/m. */
function deepSagFrame(edgeLength: number, lift = 0): Frame {
  const pts: [number, number, number][] = [
    [0, 0, 0],
    [SPAN, 0, 3 + lift],
    [SPAN, SPAN, 0],
    [0, SPAN, 3],
  ]
  const f = frame(edgeLength)
  f.loops[0] = {
    role: 'outer',
    points: pts.map(([x, y, z], i) => ({ id: `p${i}`, x, y, z })),
    edges: pts.map((_, i) => (i % 2 === 0 ? { kind: 'cable' as const, tension: 20 } : { kind: 'rigid' as const })),
  }
  return f
}

/**
 * Steep rigid frame: Scherk's u = ln(cos y / cos x) on [−a, a]², a = 72° (edge slope 72°, corner
 * slopes past 75°: the height field turns steep and the spatial path takes over), scaled to 10 m,
 * 100 frame points a side.
 */
function steepFrame(edgeLength: number, lift = 0): Frame {
  const a = (72 * Math.PI) / 180
  const scale = SPAN / (2 * a)
  const pts: [number, number, number][] = []
  const side = (from: [number, number], to: [number, number]) => {
    for (let k = 0; k < 100; k++) {
      const x = from[0] + ((to[0] - from[0]) * k) / 100,
        y = from[1] + ((to[1] - from[1]) * k) / 100
      pts.push([scale * (x + a), scale * (y + a), scale * Math.log(Math.cos(y) / Math.cos(x))])
    }
  }
  side([-a, -a], [a, -a])
  side([a, -a], [a, a])
  side([a, a], [-a, a])
  side([-a, a], [-a, -a])
  pts[50]![2] += lift
  const f = frame(edgeLength)
  f.loops[0] = {
    role: 'outer',
    points: pts.map(([x, y, z], i) => ({ id: `p${i}`, x, y, z })),
    edges: pts.map(() => ({ kind: 'rigid' as const })),
  }
  return f
}

/** One numeric LDLᵀ of the plan Laplacian on the free vertices of `mesh` (ms; analysis apart). */
function factorMs(mesh: MembraneMesh, f: Frame): number {
  const { isFixed } = frameConstraints(mesh, f)
  const pattern = trianglePattern(mesh.vertices.length / 3, mesh.triangles, isFixed)
  const weights = new Float64Array(mesh.triangles.length)
  cornerCotanWeights(weights, new Float64Array(mesh.triangles.length / 3), mesh.vertices, mesh.triangles)
  assembleCotanLaplacian(pattern, new Float64Array(3 * pattern.matrix.n), weights, 1, mesh.vertices, mesh.triangles)
  const system = new SpdSystem(pattern, rowCoordinates(mesh.vertices, pattern.freeIndex, pattern.matrix.n))
  system.refactor() // ordering and symbolic analysis, then a first factor
  const t = performance.now()
  system.refactor()
  return performance.now() - t
}

/** A hypar-like frame: a 10 m square, two opposite corners raised 3 m, plus a raised mid-edge point. */
function frame(edgeLength: number, lift = 0): Frame {
  const pts: [number, number, number][] = [
    [0, 0, 0],
    [SPAN / 2, 0, 0.5],
    [SPAN, 0, 3 + lift],
    [SPAN, SPAN, 0],
    [0, SPAN, 3],
  ]
  return {
    format: 'veilroom-frame',
    version: 1,
    units: 'm',
    prestress: { warp: 3, fill: 3, warpAngle: 0 },
    mesh: { edgeLength },
    loops: [
      {
        role: 'outer',
        points: pts.map(([x, y, z], i) => ({ id: `p${i}`, x, y, z })),
        edges: pts.map(() => ({ kind: 'rigid' as const })),
      },
    ],
  }
}

/** A fixed loop of 1e8 multiply-adds: its time says how busy the machine is (≈100 ms when idle). */
function calibrationMs(): number {
  const a = new Float64Array(1e6)
  const t = performance.now()
  for (let r = 0; r < 100; r++) for (let i = 0; i < a.length; i++) a[i]! += i * 0.5
  return performance.now() - t
}

const rssMb = (): number => process.memoryUsage().rss / 2 ** 20
const rows: Record<string, number | string | boolean>[] = []
const targets = [1000, 2000, 5000, 20000, 80000].map((n) => ({ n, path: 'height field', make: frame }))
targets.push(...[5000, 20000, 80000].map((n) => ({ n, path: 'spatial (cable)', make: cableFrame })))
targets.push(...[5000, 20000].map((n) => ({ n, path: 'spatial (deep-sag sail)', make: deepSagFrame })))
targets.push({ n: 20000, path: 'steep rigid (Scherk 72°)', make: steepFrame })
const only = process.env.BENCH_ONLY
const heightColdMs = new Map<number, number>()
const runs = Number(process.env.BENCH_RUNS ?? 3)

const calibrationBefore = calibrationMs()
const largest = Number(process.env.BENCH_MAX ?? Infinity)
const chosen = targets.filter((t) => t.n <= largest && (!only || only.split(',').some((o) => t.path.includes(o))))
for (const { n: target, path, make } of chosen) {
  // a plan lattice of spacing h holds about area / (0.866 h²) vertices
  const h = Math.sqrt((SPAN * SPAN) / (0.866 * target))
  let best: Record<string, number | string | boolean> | undefined
  for (let run = 0; run < runs; run++) {
    const rss0 = rssMb()
    let peak = rss0
    let t = performance.now()
    const mesh = meshFrame(make(h))
    const meshMs = performance.now() - t
    const solver = createSurfaceSolver()
    t = performance.now()
    const cold = solver.solve(make(h))
    const coldMs = performance.now() - t
    peak = Math.max(peak, rssMb())
    t = performance.now()
    const warm = solver.solve(make(h, 0.02 * SPAN))
    const warmMs = performance.now() - t
    peak = Math.max(peak, rssMb())
    const oneFactor = factorMs(mesh, make(h))
    if (path === 'height field') heightColdMs.set(target, coldMs)
    const heightCold = heightColdMs.get(target)
    const row = {
      path,
      vertices: mesh.vertices.length / 3,
      meshMs: round(meshMs),
      coldMs: round(coldMs),
      coldSolverMs: round(cold.report.ms),
      coldIterations: cold.report.iterations,
      warmMs: round(warmMs),
      warmSolverMs: round(warm.report.ms),
      warmIterations: warm.report.iterations,
      method: cold.report.method,
      factorMs: round(oneFactor),
      coldPerFactor: round(coldMs / oneFactor),
      coldPerHeightField: path.startsWith('spatial') && heightCold ? round(coldMs / heightCold) : '',
      settled: cold.report.converged && warm.report.converged,
      residual: Number(warm.report.residual.toExponential(2)),
      peakRssMb: round(peak),
      rssGrowthMb: round(peak - rss0),
    }
    if (!best || row.coldMs + row.warmMs < Number(best.coldMs) + Number(best.warmMs)) best = row
  }
  rows.push(best!)
  console.log(`${path} ${target} done`)
}

function round(x: number): number {
  return Math.round(x * 10) / 10
}

const pattern = patternBench()
const calibrationAfter = calibrationMs()
console.table(rows)
console.table([pattern])
const load = loadavg()
console.log(
  `calibration loop ${round(calibrationBefore)} ms before, ${round(calibrationAfter)} ms after (≈100 ms on an idle core)`,
)
console.log(`best of ${runs} runs per size; load average ${load.map((l) => l.toFixed(1)).join(' ')} (1, 5, 15 min)`)
console.log('cold/warm ms include meshing/remapping; *SolverMs is the solver alone.')
mkdirSync('bench-results', { recursive: true })
writeFileSync(
  'bench-results/solver.json',
  JSON.stringify(
    {
      date: new Date().toISOString(),
      loadAverage: load,
      calibrationMs: [calibrationBefore, calibrationAfter],
      runs,
      rows,
      pattern,
    },
    null,
    2,
  ),
)
console.log('wrote bench-results/solver.json')
