/** Route parameters naming one revision of a system: /labs/:lab/systems/:system/revisions/:number. */
import { z } from 'zod'
import { SystemParams } from '../../shared/utils/lab-schemas'

export const RevisionParams = SystemParams.extend({
  number: z.coerce.number({ error: 'A revision number is a whole number, e.g. 3' })
    .int({ error: 'A revision number is a whole number, e.g. 3' })
    .positive({ error: 'Revision numbers start at 1' }),
})
