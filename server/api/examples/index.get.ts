/**
 * GET /api/examples — the example systems shipped in examples/, to start a
 * new system from: address, title, the opening comment as a summary, and the
 * text itself (they are small). Public: the examples pages are readable
 * signed out.
 */
import { readExamples } from '../../utils/examples'

export default defineEventHandler(async () => {
  return { examples: await readExamples() }
})
