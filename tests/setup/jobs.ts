/** Stored runs are jobs on the study queue: helpers to start one and wait for it through the API, as a client would. */
import { expect } from 'vitest'
import { api, type ApiAnswer } from './accounts'

const ACTIVE = ['queued', 'running']

/** Reads a run until `until` holds for it (by default: it ended), every `everyMs`; answers every answer read, in order. */
export async function pollRun(path: string, who: { cookie: string }, until: (run: any) => boolean = (run) => !ACTIVE.includes(run.jobStatus), everyMs = 100, limitMs = 180_000): Promise<any[]> {
  const seen: any[] = []
  const deadline = Date.now() + limitMs
  for (;;) {
    const answer = await api(path, { cookie: who.cookie })
    expect(answer.status, JSON.stringify(answer.body)).toBe(200)
    seen.push(answer.body)
    if (until(answer.body)) return seen
    if (Date.now() > deadline) throw new Error(`Run ${path} did not reach the state waited for; last seen: ${JSON.stringify({ ...answer.body, model: undefined, result: undefined })}`)
    await new Promise((r) => setTimeout(r, everyMs))
  }
}

/**
 * POSTs to a system's `…/runs` and, when the run was queued (201), waits
 * until its job ended: answers the POST's answer with, as its body, the run
 * as GET …/runs/:id gives it then (with its result and model). A refusal
 * comes back as it is.
 */
export async function storeRunToEnd(runsPath: string, options: { cookie: string, body?: unknown }): Promise<ApiAnswer> {
  const queued = await api(runsPath, { method: 'POST', cookie: options.cookie, body: options.body ?? {} })
  if (queued.status !== 201) return queued
  expect(queued.body.jobStatus).toBe('queued')
  const seen = await pollRun(`${runsPath}/${queued.body.id}`, options)
  return { ...queued, body: seen.at(-1) }
}
