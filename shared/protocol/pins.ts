/** Review pins as the API returns them and the `pin:changed` / `pin:deleted` events carry them. */
import { z } from 'zod'

const person = z
  .object({ id: z.string().min(1), name: z.string() })
  .nullable()
  .catch(null)
const num = z.number()

export const pinReplySchema = z.object({
  id: z.string().min(1),
  body: z.string(),
  author: person,
  createdAt: z.string(),
})

/** A pin: a point of the surface (metres), the document version it was placed on, its thread. */
export const pinSchema = z.object({
  id: z.string().min(1),
  x: num,
  y: num,
  z: num,
  docVersion: num,
  body: z.string(),
  resolved: z.boolean(),
  author: person,
  createdAt: z.string(),
  updatedAt: z.string(),
  replies: z.array(pinReplySchema),
})
export type Pin = z.infer<typeof pinSchema>

/** The `pin:changed` event: a pin was added, replied to, edited, resolved or reopened. */
export const pinChangedEventSchema = z.object({ roomId: z.string(), pin: pinSchema })
export type PinChangedEvent = z.infer<typeof pinChangedEventSchema>

/** The `pin:deleted` event. */
export const pinDeletedEventSchema = z.object({ roomId: z.string(), pinId: z.string() })
export type PinDeletedEvent = z.infer<typeof pinDeletedEventSchema>
