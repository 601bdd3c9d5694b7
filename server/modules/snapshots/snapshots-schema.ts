import { z } from 'zod'
import { multiLineField, nameField } from '../../lib/text-fields.js'

export const createSnapshotBody = z.object({
  name: nameField(120),
  note: multiLineField(2000).default(''),
})

export type CreateSnapshotBody = z.output<typeof createSnapshotBody>
