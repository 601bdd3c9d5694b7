/**
 * Checks run before a form is sent, mirroring the server's rules (API contract, issue 2) so most
 * mistakes are caught without a round trip. The server still decides; its errors arrive by field.
 */
export const limits = { passwordMin: 10, roomNameMax: 120, descriptionMax: 2000, userNameMax: 120 } as const

// Deliberately loose: one "@" with something on both sides and a dot in the domain. The server
// (and the mail that gets through) is the real check.
const emailShape = /^[^\s@]+@[^\s@]+\.[^\s@]+$/

export function checkEmail(email: string): string | undefined {
  if (!email.trim()) return 'Enter your e-mail address.'
  if (!emailShape.test(email.trim())) return 'This does not look like an e-mail address.'
  return undefined
}

export function checkSignIn(input: { email: string; password: string }) {
  const errors: { email?: string; password?: string } = {}
  const email = checkEmail(input.email)
  if (email) errors.email = email
  if (!input.password) errors.password = 'Enter your password.'
  return errors
}

export function checkSignUp(input: { email: string; name: string; password: string }) {
  const errors: { email?: string; name?: string; password?: string } = {}
  const email = checkEmail(input.email)
  if (email) errors.email = email
  if (!input.name.trim()) errors.name = 'Enter the name your team knows you by.'
  else if (input.name.trim().length > limits.userNameMax) errors.name = `At most ${limits.userNameMax} characters.`
  if (input.password.length < limits.passwordMin) {
    errors.password = `Use at least ${limits.passwordMin} characters.`
  }
  return errors
}

export function checkRoom(input: { name: string; description: string }) {
  const errors: { name?: string; description?: string } = {}
  const name = input.name.trim()
  if (!name) errors.name = 'Give the room a name, e.g. the structure and the site.'
  else if (name.length > limits.roomNameMax) errors.name = `At most ${limits.roomNameMax} characters.`
  if (input.description.trim().length > limits.descriptionMax) {
    errors.description = `At most ${limits.descriptionMax} characters.`
  }
  return errors
}
