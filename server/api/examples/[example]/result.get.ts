/**
 * GET /api/examples/:example/result — an example solved by Equipoise, for
 * anyone (the signed-out home page shows one): its compiled model and its
 * answer (a Result, a sweep or a titration), computed by the solver pool on
 * first request and kept for the life of the process (the examples ship with
 * the server, so the answer cannot change until it restarts). Nothing is
 * stored; at most one solve per example, counted as one shared account. A
 * map example is compiled, not solved (its answer is many sweeps).
 */
import { COMPILER_VERSION } from '#shared/poise/version'
import type { ExampleResult } from '#shared/types/examples'
import { ExampleParams as Params, readExamples } from '../../../utils/examples'

/** The pool's account for solves nobody signed in for. */
const SHOWCASE_ACCOUNT = 0
const answers = new Map<string, Promise<ExampleResult>>()

async function solveExample(slug: string, title: string, source: string): Promise<ExampleResult> {
  const { model } = compileForSolve(source)
  // A map is many sweeps: its example page describes it and leaves the solve to the workbench.
  if (model.map) return { slug, title, kind: 'map', solverVersion: null, compilerVersion: COMPILER_VERSION, model, result: null }
  const output = await solveInPool(model, SHOWCASE_ACCOUNT)
  return { slug, title, kind: output.kind, solverVersion: output.solverVersion, compilerVersion: COMPILER_VERSION, model, result: JSON.parse(output.resultJson) }
}

export default defineEventHandler(async (event) => {
  const { example } = validateParams(event, Params)
  const found = (await readExamples()).find((e) => e.slug === example)
  if (!found) throw createError({ statusCode: 404, message: `There is no example called "${example}"` })
  let answer = answers.get(found.slug)
  if (!answer) {
    answer = solveExample(found.slug, found.title, found.source)
    answers.set(found.slug, answer)
    // A refusal (a busy server) is not kept: the next visitor asks again.
    answer.catch(() => answers.delete(found.slug))
  }
  return await answer
})
