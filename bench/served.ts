/**
 * The figures that need the built server: a 1,000-point sweep through
 * POST /api/solve (answer decoded, as a client would), and the workbench
 * opened cold in Debian's Chromium (time to a usable editor, time to the
 * first result, bytes transferred).
 */
import { chromium } from 'playwright-core'
import { DEMO_LAB } from '../server/database/seed'
import { benchSystemSource } from './systems'
import type { BuiltServer } from './builtServer'
import { BINARY_ANSWER_TYPE, decodeBinaryAnswer } from '../shared/results/binary-answer'

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

/**
 * Median ms of a 1,000-point sweep through HTTP, and the bytes of its answer
 * on the wire: by columns (`columns`, what the workbench asks for, decoded
 * into typed-array views) or as points (JSON, what the command line and
 * stored runs get, parsed).
 */
export async function httpSweepMs(server: BuiltServer, form: 'columns' | 'points', reps = 7): Promise<{ ms: number, wireBytes: number, decodedBytes: number }> {
  const body = JSON.stringify({ source: benchSystemSource('sweep pH from 4 to 12 points 1000') })
  const headers = {
    'content-type': 'application/json', 'accept-encoding': 'br, gzip', cookie: server.cookie,
    accept: form === 'columns' ? `${BINARY_ANSWER_TYPE}, application/json` : 'application/json',
  }
  const once = async () => {
    const t0 = performance.now()
    const answer = await fetch(`${server.base}/api/solve`, { method: 'POST', headers, body })
    if (!answer.ok) throw new Error(`the sweep answered ${answer.status}: ${(await answer.text()).slice(0, 200)}`)
    let decodedBytes: number
    if (form === 'columns') {
      if (answer.headers.get('content-type') !== BINARY_ANSWER_TYPE) throw new Error(`the sweep answered ${answer.headers.get('content-type')}, not columns`)
      const bytes = await answer.arrayBuffer()
      decodeBinaryAnswer(bytes)
      decodedBytes = bytes.byteLength
    } else {
      const text = await answer.text()
      JSON.parse(text)
      decodedBytes = Buffer.byteLength(text)
    }
    return { ms: performance.now() - t0, decodedBytes }
  }
  await once()
  const times: number[] = []
  let decodedBytes = 0
  for (let k = 0; k < reps; k++) { const r = await once(); times.push(r.ms); decodedBytes = r.decodedBytes }
  // Bytes on the wire: the same request without letting fetch decode it.
  const { request } = await import('node:http')
  const wireBytes = await new Promise<number>((resolveBytes, reject) => {
    const req = request(`${server.base}/api/solve`, { method: 'POST', headers }, (res) => {
      let n = 0
      res.on('data', (chunk: Buffer) => { n += chunk.length })
      res.on('end', () => resolveBytes(n))
    })
    req.on('error', reject)
    req.end(body)
  })
  return { ms: median(times), wireBytes, decodedBytes }
}

export interface WorkbenchFigures {
  usableMs: number, firstResultMs: number, transferredBytes: number, decodedBytes: number
  /** The sign-in page, cold: what a page without the editor and the plots carries. */
  loginTransferredBytes: number, loginDecodedBytes: number
  /** The printable report of a stored run of the same system, cold: to the summary shown and Nuxt hydrated. */
  reportUsableMs: number, reportTransferredBytes: number, reportDecodedBytes: number
}

/** Bytes over the wire and decoded for everything the page loaded so far. */
const pageBytes = () => {
  const entries = [...performance.getEntriesByType('navigation'), ...performance.getEntriesByType('resource')] as PerformanceResourceTiming[]
  return { transferred: entries.reduce((a, e) => a + e.transferSize, 0), decoded: entries.reduce((a, e) => a + e.decodedBodySize, 0) }
}

/** The workbench of a seeded example, each time in a fresh browser context (cold cache). Medians over `reps`. */
export async function workbenchMs(server: BuiltServer, reps = 3): Promise<WorkbenchFigures> {
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  })
  const rows: WorkbenchFigures[] = []
  const system = `${server.base}/labs/${DEMO_LAB.slug}/systems/copper-rinse-tank`
  // A stored run of the system, for its report.
  const stored = await fetch(`${server.base}/api/labs/${DEMO_LAB.slug}/systems/copper-rinse-tank/runs`, { method: 'POST', headers: { 'content-type': 'application/json', origin: server.base, cookie: server.cookie }, body: '{}' })
  if (!stored.ok) throw new Error(`storing a run for the report answered ${stored.status}`)
  // A stored run is a job: wait until the worker beside the server has stored its answer.
  const { id } = await stored.json() as { id: number }
  for (;;) {
    const run = await (await fetch(`${server.base}/api/labs/${DEMO_LAB.slug}/systems/copper-rinse-tank/runs/${id}`, { headers: { cookie: server.cookie } })).json() as { jobStatus: string }
    if (run.jobStatus === 'done') break
    if (run.jobStatus !== 'queued' && run.jobStatus !== 'running') throw new Error(`the run for the report ended ${run.jobStatus}`)
    await new Promise((r) => setTimeout(r, 100))
  }
  const hydrated = () => (window as unknown as { useNuxtApp?: () => { isHydrating: boolean } }).useNuxtApp?.().isHydrating === false
  try {
    for (let k = 0; k < reps + 1; k++) {
      const context = await browser.newContext()
      await context.addCookies([{ name: server.cookie.split('=')[0], value: server.cookie.slice(server.cookie.indexOf('=') + 1), url: server.base }])
      const page = await context.newPage()
      const t0 = performance.now()
      await page.goto(system, { waitUntil: 'commit' })
      await page.locator('.cm-content').waitFor()
      await page.waitForFunction(hydrated)
      const usableMs = performance.now() - t0
      await page.locator('.cm-content').click()
      await page.keyboard.press('Control+Enter')
      await page.locator('[data-test=summary-ph]').waitFor()
      const firstResultMs = performance.now() - t0
      const bytes = await page.evaluate(pageBytes)
      await context.close()
      const signedOut = await browser.newContext()
      const login = await signedOut.newPage()
      await login.goto(`${server.base}/login`, { waitUntil: 'load' })
      await login.waitForFunction(hydrated)
      const loginBytes = await login.evaluate(pageBytes)
      await signedOut.close()
      const forReport = await browser.newContext()
      await forReport.addCookies([{ name: server.cookie.split('=')[0], value: server.cookie.slice(server.cookie.indexOf('=') + 1), url: server.base }])
      const reportPage = await forReport.newPage()
      const r0 = performance.now()
      await reportPage.goto(`${system}/report`, { waitUntil: 'commit' })
      await reportPage.locator('[data-test=summary-ph]').waitFor()
      await reportPage.waitForFunction(hydrated)
      const reportUsableMs = performance.now() - r0
      const reportBytes = await reportPage.evaluate(pageBytes)
      await forReport.close()
      if (k > 0) {
        rows.push({
          usableMs, firstResultMs, transferredBytes: bytes.transferred, decodedBytes: bytes.decoded, loginTransferredBytes: loginBytes.transferred, loginDecodedBytes: loginBytes.decoded,
          reportUsableMs, reportTransferredBytes: reportBytes.transferred, reportDecodedBytes: reportBytes.decoded,
        })
      }
    }
  } finally {
    await browser.close()
  }
  return {
    usableMs: median(rows.map(r => r.usableMs)),
    firstResultMs: median(rows.map(r => r.firstResultMs)),
    transferredBytes: median(rows.map(r => r.transferredBytes)),
    decodedBytes: median(rows.map(r => r.decodedBytes)),
    loginTransferredBytes: median(rows.map(r => r.loginTransferredBytes)),
    loginDecodedBytes: median(rows.map(r => r.loginDecodedBytes)),
    reportUsableMs: median(rows.map(r => r.reportUsableMs)),
    reportTransferredBytes: median(rows.map(r => r.reportTransferredBytes)),
    reportDecodedBytes: median(rows.map(r => r.reportDecodedBytes)),
  }
}
