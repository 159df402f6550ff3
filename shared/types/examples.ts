/** Answers of the examples routes (server/api/examples), as the pages read them. */
import type { Model } from '../poise/model'
import type { AnswerKind } from './result'

/** GET /api/examples/:example (and each item of GET /api/examples). */
export interface ExampleView {
  slug: string
  title: string
  /** The opening comment lines, joined: what the example is about. */
  summary: string
  source: string
}

/** GET /api/examples/:example/result: the example solved by this server. */
export interface ExampleResult {
  slug: string
  title: string
  kind: AnswerKind
  /** null for a map (compiled, not solved here). */
  solverVersion: string | null
  compilerVersion: string
  model: Model
  /** The Result, SweepResult or TitrationResult, as the workbench receives it; null for a map (not solved here). */
  result: unknown
}
