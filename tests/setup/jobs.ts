/** Stored runs are jobs on the study queue: helpers to start one and wait for it through the API, as a client would. */
import { expect } from 'vitest'
import { api, type SignedIn } from './accounts'

const ACTIVE = ['queued', 'running']

/** Reads a run until `until` holds for it (by default: it ended), every `everyMs`; answers every answer read, in order. */
export async function pollRun(path: string, who: SignedIn, until: (run: any) => boolean = (run) => !ACTIVE.includes(run.jobStatus), everyMs = 100, limitMs = 120_000): Promise<any[]> {
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
 * POSTs a run of `systemPath` and waits until its job ended; answers the run
 * as GET …/runs/:id gives it then (with its result and model).
 */
export async function runToEnd(systemPath: string, who: SignedIn, body: Record<string, unknown> = {}): Promise<any> {
  const queued = await api(`${systemPath}/runs`, { method: 'POST', cookie: who.cookie, body })
  expect(queued.status, JSON.stringify(queued.body)).toBe(201)
  const seen = await pollRun(`${systemPath}/runs/${queued.body.id}`, who)
  return seen.at(-1)
}
