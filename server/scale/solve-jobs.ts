/**
 * The solve-job contract between app instances (producers) and `npm run worker` processes: queue
 * names, Redis keys, the job's data (zod-checked by the worker, which trusts nothing in Redis) and
 * the codec of the surfaces kept in Redis for clients that join later.
 */
import { deserialize, serialize } from 'node:v8'
import { z } from 'zod'

/** BullMQ queue every worker serves. */
export const SHARED_QUEUE = 'vr-solve'
/** A worker's own queue: jobs of rooms whose warm state it holds. */
export const workerQueue = (workerId: string): string => `vr-solve-w-${workerId}`
/** Job name (BullMQ wants one). */
export const JOB_NAME = 'solve'

export const keys = {
  /** JSON { key, jobId, version }: the newest solve asked for; any other job of the room is stale. */
  latest: (roomId: string) => `vr:solve:latest:${roomId}`,
  /** v8-serialised `surface`, `solve:state` and `pattern` payloads last sent to the room (hash fields). */
  out: (roomId: string) => `vr:solve:out:${roomId}`,
  /** v8-serialised settled fine surface with its frame key (and its pattern result, once laid flat). */
  settled: (roomId: string) => `vr:solve:settled:${roomId}`,
  /** The worker that holds the room's warm state. */
  home: (roomId: string) => `vr:solve:home:${roomId}`,
  /** The worker solving the room right now (operators and the cluster tests read it). */
  running: (roomId: string) => `vr:solve:running:${roomId}`,
  /** Hash workerId → last heartbeat (ms since epoch). */
  workers: 'vr:solve:workers',
  /** Lock taken by the worker that moves a dead worker's jobs to the shared queue. */
  rescue: (workerId: string) => `vr:solve:rescue:${workerId}`,
  /** Pub/sub: a jobId whose running solve should stop (a newer frame arrived). */
  cancel: 'vr:solve:cancel',
}

/** A worker is alive while its heartbeat is younger than this. */
export const WORKER_ALIVE_MS = 4000
export const HEARTBEAT_MS = 1000
/** Keys of a room's solve state outlive an idle room by a day, then Redis drops them. */
export const ROOM_TTL_S = 86_400

export const jobDataSchema = z.object({
  roomId: z.uuid(),
  /** The raw frame read from the room document; the worker validates it. */
  frame: z.unknown(),
  /** Hash of the frame: equal frames share one solve. */
  key: z.string().min(1).max(128),
  version: z.number().int().min(0),
  /** Base64 of the document's state vector at enqueue (clients tell whether a surface has their edit). */
  stateVector: z.base64(),
  /** The room's seams as the instance read them (RoomCuts); the worker checks them again. */
  cuts: z.unknown().optional(),
})
export type SolveJobData = z.infer<typeof jobDataSchema>

export const latestSchema = z.object({ key: z.string(), jobId: z.string(), version: z.number() })
export type LatestSolve = z.infer<typeof latestSchema>

/** Node-to-Node codec for payloads with typed arrays (both ends are our own processes). */
export const encodePayload = (payload: unknown): Buffer => serialize(payload)
export const decodePayload = (bytes: Buffer): unknown => deserialize(bytes) as unknown

/**
 * Atomic gate for a room's newest solve: skipped when the same frame key is already the newest,
 * otherwise recorded with a version never below the previous one (instances count versions apart).
 * Returns [1 = enqueue | 0 = skip, previous JSON or '', version].
 */
export const GATE_SCRIPT = `
local old = redis.call('GET', KEYS[1])
local version = tonumber(ARGV[3])
if old then
  local o = cjson.decode(old)
  if o.key == ARGV[1] and ARGV[4] ~= '1' then return {0, old, o.version} end
  if o.version > version then version = o.version end
end
redis.call('SET', KEYS[1], cjson.encode({key = ARGV[1], jobId = ARGV[2], version = version}), 'EX', ${ROOM_TTL_S})
return {1, old or '', version}
`
