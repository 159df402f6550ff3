/**
 * GET /api/examples — the example systems shipped in examples/, to start a
 * new system from: address, title, the opening comment as a summary, and the
 * text itself (they are small).
 */
import { readExamples } from './[example].get'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  return { examples: await readExamples() }
})
