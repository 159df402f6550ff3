/**
 * Child process of `npm run bench`: one 20,000-point pH sweep of the bench
 * system through the worker's own task function (solve and encode the answer,
 * as the solver pool does), then prints the process's peak RSS in MB.
 * `node --import tsx bench/sweepRss.ts columns|points`: the answer by columns
 * (what the workbench asks for) or as points (stored runs, the command line).
 */
import { compile } from '../shared/poise/index'
import { solveTask, type AnswerForm } from '../server/workers/solve.worker'
import { benchSystemSource } from './systems'

const POINTS = 20_000
const form = (process.argv[2] ?? 'columns') as AnswerForm
const model = compile(benchSystemSource('sweep pH from 4 to 12 points 2')).model!
// The language caps a sweep at 5,000 points; the figure asks for 20,000 (the cap is a request limit, not the solver's).
model.sweep!.values = Array.from({ length: POINTS }, (_, i) => 4 + (8 * i) / (POINTS - 1))
const startRssMB = process.memoryUsage().rss / 2 ** 20
const output = solveTask({ model, timeBudgetMs: 60_000, form })
if (output.failedPoints) throw new Error(`${output.failedPoints} points failed`)
const answerBytes = output.resultBytes.byteLength + (output.resultArrays ?? []).reduce((a, b) => a + b.byteLength, 0)
console.log(JSON.stringify({ peakRssMB: process.resourceUsage().maxRSS / 1024, startRssMB, answerMB: answerBytes / 2 ** 20, elapsedMs: output.elapsedMs }))
