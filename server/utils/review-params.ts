/** Route parameters naming one review of a lab: /labs/:lab/reviews/:id. */
import { z } from 'zod'
import { LabParams } from '../../shared/utils/lab-schemas'

export const ReviewParams = LabParams.extend({
  id: z.coerce.number({ error: 'A review id is a whole number' }).int({ error: 'A review id is a whole number' }).positive({ error: 'A review id is a whole number' }),
})
