import { z } from 'zod'

const email = z.email('not a valid e-mail address').max(254).transform((s) => s.trim().toLowerCase())

export const signUpBody = z.object({
  email,
  name: z.string().trim().min(1, 'required').max(120, 'at most 120 characters'),
  password: z.string().min(10, 'at least 10 characters').max(200, 'at most 200 characters'),
})

export const signInBody = z.object({
  email,
  password: z.string().min(1, 'required').max(200),
})

export type SignUpBody = z.output<typeof signUpBody>
