/**
 * Issue 12 item 1: no exception that escapes a callback may end the server. A real Node process
 * installs the guards, then throws from a timer and rejects a promise nobody awaits; it must log
 * both and still run its next timer (without the guards Node 20 exits on either).
 */
import { spawn } from 'node:child_process'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'

const root = resolve(import.meta.dirname, '../..')

function runScript(withGuards: boolean): Promise<{ code: number | null; out: string }> {
  const script = [
    withGuards
      ? "const { installProcessGuards } = await import('./server/lib/process-guards.ts'); installProcessGuards();"
      : '',
    "setTimeout(() => { throw new Error('thrown from a timer') }, 5);",
    "setTimeout(() => { void Promise.reject(new Error('rejected, never awaited')) }, 10);",
    "setTimeout(() => console.log('still serving'), 50);",
  ].join('\n')
  return new Promise((done) => {
    const child = spawn(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], {
      cwd: root,
      env: { ...process.env, LOG_LEVEL: 'info' },
    })
    let out = ''
    child.stdout.on('data', (c: Buffer) => (out += c.toString()))
    child.stderr.on('data', (c: Buffer) => (out += c.toString()))
    child.on('exit', (code) => done({ code, out }))
  })
}

describe('process guards', () => {
  it('log an uncaught exception and an unhandled rejection and keep the process running', async () => {
    const guarded = await runScript(true)
    expect(guarded.out).toContain('uncaught exception (kept serving)')
    expect(guarded.out).toContain('thrown from a timer')
    expect(guarded.out).toContain('unhandled rejection (kept serving)')
    expect(guarded.out).toContain('still serving')
    expect(guarded.code).toBe(0)
  }, 30_000)

  it('are what keeps it alive: the same script without them exits at the first throw', async () => {
    const bare = await runScript(false)
    expect(bare.out).not.toContain('still serving')
    expect(bare.code).not.toBe(0)
  }, 30_000)
})
