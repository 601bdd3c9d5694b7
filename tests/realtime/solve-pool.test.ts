/**
 * The solve pool with real worker threads running the real engine (TypeScript loaded through tsx,
 * also under vitest). Checks: a result matches the engine run in this thread; a cancelled job
 * stops inside the engine (its report says 'cancelled'); room affinity and the cold take-over; the
 * surface is answered before its pattern, and the room's next job stops a flattening still running.
 */
import { afterAll, describe, expect, it } from 'vitest'
import { createSurfaceSolver } from '../../shared/engine.js'
import { starterFrame } from '../../shared/room-doc/starters.js'
import type { Frame } from '../../shared/types.js'
import { SolvePool, type SolveOutcome } from '../../server/realtime/solve-pool.js'
import type { RoomCuts } from '../../shared/pattern/index.js'

const pool = new SolvePool(2)
afterAll(() => pool.close())

/** The blank square with one raised corner, at element size h (m). */
function square(h: number, z = 0.9): Frame {
  const frame = starterFrame('blank')
  frame.mesh.edgeLength = h
  frame.loops[0]!.points[2]!.z = z
  return frame
}

/** Seams every 2 m across x (three strips on the 6 m square). */
const cuts: RoomCuts = {
  settings: { warpAngle: 0, compensation: { warp: 0, fill: 0 }, seamAllowance: 0, rollWidth: 2.5 },
  families: [{ id: 'f1', kind: 'parallel', angle: 0, spacing: 2, offset: 0.5 }],
}

function result(o: SolveOutcome) {
  if (o.kind !== 'result') throw new Error(`expected a result, got ${JSON.stringify(o)}`)
  return o
}

describe('SolvePool', () => {
  it('returns the same surface as the engine run in this thread (float32 of the float64 result)', async () => {
    const frame = square(0.4)
    const fromPool = result(await pool.solve('same', frame).done)
    const local = createSurfaceSolver().solve(frame)
    expect(fromPool.vertices.length).toBe(local.mesh.vertices.length)
    expect(Array.from(fromPool.triangles)).toEqual(Array.from(local.mesh.triangles))
    let worst = 0
    for (let i = 0; i < local.mesh.vertices.length; i++)
      worst = Math.max(worst, Math.abs(fromPool.vertices[i]! - local.mesh.vertices[i]!))
    // float32 keeps ~7 significant digits: for coordinates ≤ 6 m, rounding is below 1e-6 m.
    expect(worst).toBeLessThan(1e-6)
    expect(fromPool.solver.converged).toBe(true)
    expect(fromPool.figures.area).toBeGreaterThan(36)
  })

  it('stops a cancelled solve inside the engine', async () => {
    // A fine, far-from-flat frame needs several Newton steps: cancel at the first progress report.
    const handle = pool.solve('cancel-me', square(0.06, 2.5), { onProgress: () => handle.cancel() })
    const outcome = await handle.done
    expect(outcome.kind).toBe('cancelled')
    if (outcome.kind === 'cancelled') expect(outcome.solver?.reason).toBe('cancelled')
  })

  it('keeps a room on its worker, and lets an idle worker take it cold when that one is busy', async () => {
    const a = result(await pool.solve('room-a', square(0.5)).done)
    const b = result(await pool.solve('room-b', square(0.5)).done)
    expect(b.worker).not.toBe(a.worker)
    expect(result(await pool.solve('room-a', square(0.5, 1)).done).worker).toBe(a.worker)
    // Keep room A's worker busy with a slow job of room C (it goes to A's worker: both workers are
    // home to one room, ties go to the lower index, which is A's as A was placed first).
    // Its first progress report proves it is running on a worker (not still queued).
    let started!: () => void
    const running = new Promise<void>((r) => (started = r))
    const slow = pool.solve('room-c', square(0.06, 2.5), { onProgress: () => started() })
    await running
    const moved = result(await pool.solve('room-a', square(0.5, 1.1)).done)
    expect(moved.worker).toBe(b.worker)
    slow.cancel()
    await slow.done
  })

  it('answers the surface first, then its strips laid flat', async () => {
    const order: string[] = []
    const handle = pool.solve('cut', square(0.3), { cuts })
    const done = handle.done.then((o) => (order.push('surface'), o))
    const pattern = await handle.pattern.then((p) => (order.push('pattern'), p))
    expect(result(await done).solver.converged).toBe(true)
    expect(order).toEqual(['surface', 'pattern'])
    expect(pattern?.error).toBeNull()
    expect(pattern?.result?.strips.length).toBeGreaterThanOrEqual(3)
    // without seams there is nothing to lay flat
    expect(await pool.solve('cut', square(0.3, 1)).pattern).toBeNull()
  })

  it('stops the flattening of a surface when a newer job of the room is waiting', async () => {
    const older = pool.solve('cut-again', square(0.1), { cuts })
    // queued behind the older job on the room's worker: it raises the flag when the surface is answered
    const newer = pool.solve('cut-again', square(0.1, 1.2), { cuts })
    expect((await older.done).kind).toBe('result')
    expect(await older.pattern).toBeNull()
    expect((await newer.pattern)?.result?.strips.length).toBeGreaterThanOrEqual(3)
  })
})
