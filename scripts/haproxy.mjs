// HAProxy (Debian's haproxy) in front of the app instances, for npm run cluster and the cluster
// tests. Round robin across instances; a cookie keeps one browser on one instance, so socket.io's
// long-polling requests and its upgrade reach the same process; health checks on /api/health take a
// dead instance out within ~2 s and `option redispatch` moves its clients to a live one.
import { spawn } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { connect } from 'node:net'
import { resolve } from 'node:path'
import { ensurePackage, waitFor } from './helpers.mjs'

const root = resolve(import.meta.dirname, '..')

/** The config text: `instances` are { name, port } on 127.0.0.1. */
export function haproxyConfig({ port, instances }) {
  const servers = instances.map(
    ({ name, port: p }) => `  server ${name} 127.0.0.1:${p} cookie ${name} check inter 1s fall 2 rise 1`,
  )
  return `global
  maxconn 4096
defaults
  mode http
  timeout connect 2s
  timeout client 60s
  timeout server 60s
  # websockets (yjs sync, socket.io) stay open while idle pings flow
  timeout tunnel 1h
  option redispatch
  retries 2
frontend veilroom
  bind 127.0.0.1:${port}
  default_backend instances
backend instances
  balance roundrobin
  cookie VRINSTANCE insert indirect nocache httponly
  option httpchk GET /api/health
  http-check expect status 200
${servers.join('\n')}
`
}

const accepts = (port) =>
  new Promise((done) => {
    const socket = connect({ host: '127.0.0.1', port })
    socket.once('connect', () => (socket.destroy(), done(true)))
    socket.once('error', () => done(false))
  })

/** Starts HAProxy in the foreground as a child; resolves once it accepts connections. */
export async function startHaproxy({ port, instances }) {
  const binary = await ensurePackage('haproxy', 'haproxy')
  const dir = resolve(root, '.data')
  mkdirSync(dir, { recursive: true })
  const file = resolve(dir, `haproxy-${port}.cfg`)
  writeFileSync(file, haproxyConfig({ port, instances }))
  const child = spawn(binary, ['-f', file, '-db'], { stdio: ['ignore', 'ignore', 'inherit'] })
  let exited = false
  child.once('exit', () => (exited = true))
  await waitFor(async () => exited || (await accepts(port)), 10_000, `HAProxy did not listen on ${port}`)
  if (exited) throw new Error(`HAProxy exited at start (port ${port} taken?); config in ${file}`)
  console.log(`[haproxy] 127.0.0.1:${port} → ${instances.map((i) => i.port).join(', ')}`)
  return { child, port, file }
}
