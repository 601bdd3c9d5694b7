// Worker entry in plain JS: Node 20 does not apply `--import tsx` to a worker's own entry file,
// so the TypeScript loader is registered here before the worker module is imported.
import { register } from 'tsx/esm/api'

register()
await import('./solve-worker.ts')
