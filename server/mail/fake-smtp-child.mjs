// Starts server/mail/fake-smtp-main.ts as a child process (used by scripts/start.mjs and
// scripts/test.mjs). Plain JS so the start scripts can import it before anything is compiled.
import { spawn } from 'node:child_process'
import { resolve } from 'node:path'

const root = resolve(import.meta.dirname, '../..')

/**
 * Resolves with { child, port } once the fake server listens. env.SMTP_PORT 0 picks a free port.
 * Rejects if the child exits first (port taken, database unreachable).
 */
export function startFakeSmtpChild(env) {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(resolve(root, 'node_modules/.bin/tsx'), ['server/mail/fake-smtp-main.ts'], {
      cwd: root,
      env,
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let seen = ''
    child.stdout.on('data', (chunk) => {
      if (seen === null) return
      seen += chunk.toString()
      const match = /fake SMTP listening on [\d.]+:(\d+)/.exec(seen)
      if (match) {
        seen = null
        resolvePromise({ child, port: Number(match[1]) })
      }
    })
    child.on('exit', (code) => {
      if (seen !== null) reject(new Error(`the fake SMTP server exited (code ${code}) before listening`))
    })
  })
}
