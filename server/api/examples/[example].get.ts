/**
 * GET /api/examples/:example — one example system by its address (the file
 * name without `.poise`). The files are Nitro server assets, so the built
 * server has them without the source tree.
 */
import { ExampleParams, readExamples } from '../../utils/examples'

export const Params = ExampleParams

export default defineEventHandler(async (event) => {
  const { example } = validateParams(event, Params)
  const found = (await readExamples()).find((e) => e.slug === example)
  if (!found) throw createError({ statusCode: 404, message: `There is no example called "${example}"` })
  return found
})
