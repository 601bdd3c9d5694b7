import { z } from 'zod'

export const createSnapshotBody = z.object({
  name: z.string().trim().min(1, 'required').max(120, 'at most 120 characters'),
  note: z.string().trim().max(2000, 'at most 2000 characters').default(''),
})

export type CreateSnapshotBody = z.output<typeof createSnapshotBody>
