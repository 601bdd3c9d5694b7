/**
 * A solve worker: keeps one stateful surface solver per room it is home to (warm starts), turns the
 * pool's shared cancel flag into `signal.aborted`, throttles progress to ≤ 10 messages a second,
 * sends the surface back with its typed arrays transferred and then, for a settled surface of a room
 * with seams, lays the strips flat and sends them as a second message.
 */
import { parentPort } from 'node:worker_threads'
import { noRoomPattern, PatternError, roomPattern, type RoomPatternPayload } from '../../shared/pattern/index.js'
import { starterFrame } from '../../shared/room-doc/starters.js'
import { computeFigures, createSurfaceSolver, type SurfaceSolver } from './engine-link.js'
import type { FromWorker, SolveJobMessage, ToWorker } from './solve-messages.js'

const PROGRESS_EVERY_MS = 100
/** Rooms whose warm state a worker keeps; the oldest is dropped beyond this. */
const MAX_WARM = 8

const port = parentPort
if (!port) throw new Error('solve-worker.ts must run in a worker thread')

const solvers = new Map<string, SurfaceSolver>()

function solverFor(key: string): SurfaceSolver {
  let solver = solvers.get(key)
  if (solver) solvers.delete(key)
  else solver = createSurfaceSolver()
  solvers.set(key, solver)
  while (solvers.size > MAX_WARM) solvers.delete(solvers.keys().next().value as string)
  return solver
}

async function solve(job: SolveJobMessage): Promise<void> {
  const flag = new Int32Array(job.cancel)
  const signal = {
    get aborted() {
      return Atomics.load(flag, 0) !== 0
    },
  }
  let lastProgress = 0
  const onProgress = (iteration: number, residual: number) => {
    const t = performance.now()
    if (t - lastProgress < PROGRESS_EVERY_MS) return
    lastProgress = t
    post({ type: 'progress', jobId: job.jobId, iteration, residual })
  }
  try {
    const solver = solverFor(job.coarse ? `${job.roomId}:coarse` : job.roomId)
    const { mesh, report } = await solver.solve(job.frame, { onProgress, signal })
    const figures = computeFigures(mesh, job.frame, { residual: report.residual })
    const vertices = Float32Array.from(mesh.vertices)
    const triangles = Uint32Array.from(mesh.triangles)
    const cuts = job.cuts && !job.coarse && report.converged ? job.cuts : undefined
    // the surface goes out first: the room sees it while the strips are laid flat
    port!.postMessage(
      {
        type: 'result',
        jobId: job.jobId,
        vertices,
        triangles,
        figures,
        solver: report,
        flattens: cuts !== undefined,
      } satisfies FromWorker,
      [vertices.buffer, triangles.buffer],
    )
    if (cuts) flatten(job.jobId, mesh.vertices, mesh.triangles, cuts, signal)
  } catch (err) {
    post({ type: 'failed', jobId: job.jobId, message: err instanceof Error ? err.message : String(err) })
  }
}

/**
 * Lays the strips flat and sends them; the job's cancel flag (raised by the room's next solve)
 * stops it between strips and iterations. A fault here is the pattern's, not the surface's: it is
 * sent as the pattern's error.
 */
function flatten(jobId: number, ...[vertices, triangles, cuts, signal]: Parameters<typeof roomPattern>): void {
  let pattern: RoomPatternPayload | undefined
  try {
    pattern = roomPattern(vertices, triangles, cuts, signal)
  } catch (err) {
    if (!(err instanceof PatternError && err.code === 'cancelled'))
      pattern = noRoomPattern(
        { code: 'pattern-failed', field: 'pattern', message: err instanceof Error ? err.message : String(err) },
        cuts.settings,
      )
  }
  port!.postMessage({ type: 'pattern', jobId, pattern } satisfies FromWorker, pattern ? patternBuffers(pattern) : [])
}

function patternBuffers(p: RoomPatternPayload): ArrayBuffer[] {
  const arrays = [p.cutVertices, p.cutTriangles, p.triangleStrip, p.flat.uv, p.flat.triangles, p.flat.strain]
  return [...new Set(arrays.map((a) => a.buffer as ArrayBuffer))]
}

function post(m: FromWorker): void {
  port!.postMessage(m)
}

// A small solve at boot compiles the engine's hot paths before the first real job arrives.
try {
  const warm = starterFrame('blank')
  computeFigures(createSurfaceSolver().solve(warm).mesh, warm)
} catch {
  // A failing warm-up is not fatal: the real job reports its own error.
}

// Jobs run one at a time: the pool never sends a second before the first has answered.
port.on('message', (m: ToWorker) => {
  if (m.type === 'forget') {
    solvers.delete(m.roomId)
    solvers.delete(`${m.roomId}:coarse`)
  } else void solve(m)
})
