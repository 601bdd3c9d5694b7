// Small process helpers shared by the scripts: commands and server children for start.mjs,
// test.mjs and cluster.mjs; the private daemons (db.mjs, redis.mjs, haproxy.mjs) found, installed,
// started, waited for and stopped one way. Node built-ins only: start.mjs runs before npm install.
import { execFile, spawn } from 'node:child_process'
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs'
import { resolve } from 'node:path'
import { promisify } from 'node:util'

export const root = resolve(import.meta.dirname, '..')
const bin = (name) => resolve(root, 'node_modules/.bin', name)

const running = new Set()

/** Runs a command from node_modules/.bin (or PATH) with inherited output; resolves to its exit code. */
export function run(cmd, args, { env = process.env, quiet = false } = {}) {
  const file = existsSync(bin(cmd)) ? bin(cmd) : cmd
  return new Promise((resolvePromise) => {
    const child = spawn(file, args, { cwd: root, env, stdio: quiet ? 'ignore' : 'inherit' })
    running.add(child)
    child.on('exit', (code, signal) => {
      running.delete(child)
      resolvePromise(code ?? (signal ? 1 : 0))
    })
    child.on('error', (err) => {
      console.error(`[run] ${cmd}: ${err.message}`)
      resolvePromise(1)
    })
  })
}

function newestMtime(path) {
  if (!existsSync(path)) return 0
  const st = statSync(path)
  if (!st.isDirectory()) return st.mtimeMs
  let newest = st.mtimeMs
  for (const entry of readdirSync(path)) newest = Math.max(newest, newestMtime(resolve(path, entry)))
  return newest
}

/** True when dist/ is missing or older than anything the client bundle is built from. */
export function clientBuildIsStale() {
  const built = newestMtime(resolve(root, 'dist/index.html'))
  if (!built) return true
  const sources = ['src', 'shared', 'public', 'index.html', 'vite.config.ts'].map((p) => newestMtime(resolve(root, p)))
  return Math.max(...sources) > built
}

export const hasClientSources = () =>
  existsSync(resolve(root, 'index.html')) &&
  newestMtime(resolve(root, 'src')) > 0 &&
  readdirSync(resolve(root, 'src')).length > 0

/**
 * Starts `tsx server/main.ts` as a child and resolves with { child, url } once it logs its URL.
 * Its output is passed through so server errors show up in the console.
 */
export function startServerChild(env, extraArgs = []) {
  return new Promise((resolvePromise, reject) => {
    // The URL line is logged at info level; quieter levels would hide it from us.
    const level = env.LOG_LEVEL === 'debug' ? 'debug' : 'info'
    const child = spawn(bin('tsx'), ['server/main.ts', ...extraArgs], {
      cwd: root,
      env: { ...env, LOG_LEVEL: level },
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let seen = ''
    const timer = setTimeout(() => {
      if (seen === null) return
      seen = null
      child.kill('SIGTERM')
      reject(new Error('server did not report "listening on" within 60 s'))
    }, 60_000)
    child.stdout.on('data', (chunk) => {
      process.stdout.write(chunk)
      if (seen === null) return
      seen += chunk.toString()
      const match = /listening on (http:\/\/\S+)/.exec(seen)
      if (match) {
        seen = null
        clearTimeout(timer)
        resolvePromise({ child, url: match[1] })
      }
    })
    child.on('exit', (code) => {
      clearTimeout(timer)
      if (seen !== null) reject(new Error(`server exited with code ${code} before listening`))
    })
  })
}

/** Sends SIGTERM and waits for the child to exit (SIGKILL after 10 s). */
export function stopChild(child) {
  if (!child || child.exitCode !== null) return Promise.resolve()
  return new Promise((resolvePromise) => {
    const timer = setTimeout(() => child.kill('SIGKILL'), 10_000)
    child.once('exit', () => {
      clearTimeout(timer)
      resolvePromise()
    })
    child.kill('SIGTERM')
  })
}

/** Stops every command still running from run() (on Ctrl-C or a CI timeout). */
export const stopRunning = () => Promise.all([...running].map(stopChild))

/** Polls `check` (may be async) every 100 ms until it is true; throws `message` after `ms`. */
export async function waitFor(check, ms, message) {
  const end = Date.now() + ms
  while (Date.now() < end) {
    if (await check()) return
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(message)
}

/** Finds an executable on PATH or in the sbin folders Debian uses; null when absent. */
export function findBinary(name) {
  for (const dir of (process.env.PATH ?? '').split(':').concat('/usr/sbin', '/usr/bin')) {
    const path = resolve(dir || '.', name)
    if (existsSync(path)) return path
  }
  return null
}

const execFileAsync = promisify(execFile)

/**
 * The binary's path, installing its Debian package first when it is missing (needs root); the
 * package's recommended packages only with `recommends`.
 */
export async function ensurePackage(binary, pkg, { tag = pkg, recommends = false } = {}) {
  const found = findBinary(binary)
  if (found) return found
  console.log(`[${tag}] ${binary} not found: installing ${pkg} from Debian (needs root)`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  await execFileAsync('apt-get', ['update'], { maxBuffer: 64 << 20, env })
  const install = ['install', '-y', ...(recommends ? [] : ['--no-install-recommends']), pkg]
  await execFileAsync('apt-get', install, { maxBuffer: 64 << 20, env })
  const path = findBinary(binary)
  if (!path) throw new Error(`${pkg} installed but ${binary} is still missing`)
  return path
}

/** True while a process with this pid exists. */
export function alive(pid) {
  try {
    process.kill(pid, 0)
    return true
  } catch {
    return false
  }
}

/** The pid in a daemon's pid file, or null when there is none (or it is not a pid). */
export function readPid(file) {
  try {
    const pid = Number(readFileSync(file, 'utf8').trim())
    return Number.isInteger(pid) && pid > 0 ? pid : null
  } catch {
    return null
  }
}

/**
 * Starts a daemon detached from this process (it outlives npm start's Ctrl-C handling and keeps
 * its data between runs) and waits until `ready()` answers; `what` names it in the timeout error.
 */
export async function startDaemon(binary, args, { ready, ms, what }) {
  const child = spawn(binary, args, { detached: true, stdio: 'ignore' })
  child.unref()
  await waitFor(ready, ms, what)
  return child.pid
}

/** Stops the daemon named in `pidFile` (SIGTERM, so it flushes its data) and waits until it is gone. */
export async function stopDaemon(pidFile, ms, name, log) {
  const pid = readPid(pidFile)
  if (!pid || !alive(pid)) return
  process.kill(pid, 'SIGTERM')
  await waitFor(() => !alive(pid), ms, `${name} pid ${pid} did not stop`)
  log(`${name} pid ${pid} stopped`)
}
