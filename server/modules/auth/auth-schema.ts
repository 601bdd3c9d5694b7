import { z } from 'zod'
import { nameField } from '../../lib/text-fields.js'

const email = z
  .email('not a valid e-mail address')
  .max(254)
  .transform((s) => s.trim().toLowerCase())

export const signUpBody = z.object({
  email,
  name: nameField(120),
  password: z.string().min(10, 'at least 10 characters').max(200, 'at most 200 characters'),
})

export const signInBody = z.object({
  email,
  password: z.string().min(1, 'required').max(200),
})

export type SignUpBody = z.output<typeof signUpBody>
