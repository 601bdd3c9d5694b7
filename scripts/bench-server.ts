// The live benchmarks' server: our development MariaDB with a throwaway database, the app started
// in this process on a free port, and `count` signed-in people to seat in rooms.

export interface BenchServer {
  running: Awaited<ReturnType<typeof import('../server/main.js').start>>
  people: { id: string; cookie: string }[]
  /** A room with the given people: the first is owner, the rest editors. */
  room: (members: { id: string }[]) => Promise<string>
  /** Stops the server and drops the throwaway database. */
  close: () => Promise<void>
}

/** Starts the bench server with `count` people named `${prefix}${i}`. */
export async function startBenchServer(count: number, prefix: string): Promise<BenchServer> {
  // Plain-JS helper without type declarations; the specifier is a value so tsc does not look for them.
  const dbScript = './db.mjs'
  const { createDatabase, dbDefaults, dropDatabase, startDb } = (await import(dbScript)) as {
    startDb: () => Promise<{ port: number }>
    createDatabase: (o: Record<string, unknown>) => Promise<void>
    dropDatabase: (o: { port: number; database: string }) => Promise<void>
    dbDefaults: Record<string, unknown>
  }
  const db = await startDb()
  const database = `veilroom_bench_${Date.now()}`
  await createDatabase({ ...dbDefaults, port: db.port, database })
  Object.assign(process.env, {
    DB_PORT: String(db.port),
    DB_NAME: database,
    NODE_ENV: 'development',
    LOG_LEVEL: 'error',
  })
  // Imported after the environment is set: the server reads it once.
  const { loadConfig } = await import('../server/config.js')
  const { start } = await import('../server/main.js')
  const { makeRoom, makeUser, signIn } = await import('../tests/realtime/live-helpers.js')
  const running = await start({ port: 0, config: loadConfig(process.env) })
  const people: { id: string; cookie: string }[] = []
  for (let i = 0; i < count; i++) {
    const u = await makeUser(running.dataSource, `${prefix}${i}`)
    people.push({ id: u.id, cookie: await signIn(running.url, u.email) })
  }
  return {
    running,
    people,
    room: (members) =>
      makeRoom(
        running.dataSource,
        members.map((m, i) => ({ userId: m.id, role: i === 0 ? 'owner' : 'editor' })),
      ),
    close: async () => {
      await running.stop()
      await dropDatabase({ port: db.port, database })
    },
  }
}
