// Small process helpers shared by start.mjs and test.mjs.
import { spawn } from 'node:child_process'
import { existsSync, readdirSync, statSync } from 'node:fs'
import { resolve } from 'node:path'

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
