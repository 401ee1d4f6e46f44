import { z } from 'zod'
import { idValue, requiredText } from './common'

// Taking a covering out of service (removed, or replaced by another covering on the site) is a recorded act.
export const coveringRemovalSchema = z.object({
  reason: requiredText(1000, 'reason'),
  photoId: idValue('photoId').nullish().transform(v => v ?? null),
  replacedById: idValue('replacedById').nullish().transform(v => v ?? null),
})
export type CoveringRemovalCreate = z.infer<typeof coveringRemovalSchema>
