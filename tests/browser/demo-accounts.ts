/**
 * Password of a demo account: TEST_DEMO_PASSWORD wins (a server seeded elsewhere), otherwise the
 * seed module's own list, so the test never carries a copy of the password that could drift.
 */
export async function demoPassword(email: string): Promise<string> {
  if (process.env.TEST_DEMO_PASSWORD) return process.env.TEST_DEMO_PASSWORD
  // A computed path keeps the server's module graph out of the client type-check.
  const seedPath = '../../server/db/seed.ts'
  const seed = (await import(/* @vite-ignore */ seedPath)) as {
    demoAccounts?: readonly { email: string; password: string }[]
  }
  const account = seed.demoAccounts?.find((a) => a.email === email)
  if (!account) throw new Error(`No demo account ${email} in server/db/seed.ts and TEST_DEMO_PASSWORD is not set`)
  return account.password
}
