/**
 * Durability check (a benchmark, not a test): kill -9 the server in the
 * middle of a burst of saves, start it again, and look at what was kept.
 *
 *   npm run build && npm run -s bench:durability [-- --json]
 *
 * It starts the private MariaDB, fills equipoise_test_durability with the
 * migrations and the demo seed, starts the BUILT server (.output), signs in as
 * the demo editor and creates one system per writer. The writers then save
 * new revisions as fast as the server acknowledges them, each on its own
 * system (so no save conflicts with another), until the server is killed with
 * SIGKILL at a random moment. The server is started again on the same
 * database, and the check passes when
 * - every save the server acknowledged (200 with its revision number) is
 *   there: that revision, with exactly the text sent;
 * - nothing is half-written: every revision has its audit line
 *   ('system.revise', same system and number) and every such audit line its
 *   revision; a save that was in flight at the kill is either whole or absent.
 * Exit code 1 when it does not pass.
 */
import mysql from 'mysql2/promise'
import { freePort } from '../scripts/free-port'
import { DEMO_LAB, DEMO_PASSWORD } from '../server/database/seed'
import { freshBenchDatabase, hasBuiltServer, signInAsDemoEditor, spawnBuiltServer } from './builtServer'

const asJson = process.argv.includes('--json')
const DATABASE = 'equipoise_test_durability'
const WRITERS = 8
/** The kill comes at a random moment in this window after the burst starts. */
const KILL_AFTER_MS: [number, number] = [1500, 3000]
const SESSION = `durability-check-${Date.now()}-only-for-this-run-xxxxxxxx`

function say(line: string) { if (!asJson) console.log(line) }

function sourceOf(writer: number, save: number): string {
  return `system "Durability ${writer}"\nactivity ideal\ncomponent H+ total 1 mmol/L\ncomponent Cl- total 1 mmol/L\nreaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"\n# writer ${writer}, save ${save}\n`
}

interface Ack { writer: number, number: number, source: string }

async function main() {
  if (!hasBuiltServer()) {
    console.error('No built server in .output/: run `npm run build` first, then `npm run -s bench:durability`.')
    process.exit(2)
  }
  const databaseUrl = await freshBenchDatabase(DATABASE, asJson)
  const httpPort = await freePort()
  /** The built server, started again on the same port and database after the kill. */
  const startServer = () => spawnBuiltServer(databaseUrl, httpPort, SESSION, { NUXT_MAIL_HOST: '' })
  let server = await startServer()
  const headers = (cookie?: string) => ({ 'content-type': 'application/json', origin: server.base, ...(cookie ? { cookie } : {}) })
  const cookie = await signInAsDemoEditor(server.base)
  const slug = (writer: number) => `durability-${writer}`
  for (let w = 0; w < WRITERS; w++) {
    const created = await fetch(`${server.base}/api/labs/${DEMO_LAB.slug}/systems`, { method: 'POST', headers: headers(cookie), body: JSON.stringify({ title: `Durability ${w}`, slug: slug(w), source: sourceOf(w, 0) }) })
    if (created.status !== 201) throw new Error(`Creating ${slug(w)} failed (${created.status})`)
  }

  // The burst: each writer saves the next revision as soon as the last one is acknowledged.
  const acks: Ack[] = []
  let sent = 0
  let refused = 0
  let killed = false
  const writer = async (w: number) => {
    let latest = 1
    for (let save = 1; !killed; save++) {
      const source = sourceOf(w, save)
      sent++
      try {
        const answer = await fetch(`${server.base}/api/labs/${DEMO_LAB.slug}/systems/${slug(w)}`, { method: 'PATCH', headers: headers(cookie), body: JSON.stringify({ source, message: `save ${save}`, baseRevision: latest }) })
        const body = await answer.json() as { system?: { latest?: { number: number } } }
        if (answer.status !== 200 || !body.system?.latest) { refused++; continue }
        latest = body.system.latest.number
        acks.push({ writer: w, number: latest, source })
      } catch {
        return // the connection died with the server: not acknowledged
      }
    }
  }
  const writers = Array.from({ length: WRITERS }, (_, w) => writer(w))
  const killAfter = KILL_AFTER_MS[0] + Math.random() * (KILL_AFTER_MS[1] - KILL_AFTER_MS[0])
  await new Promise(r => setTimeout(r, killAfter))
  killed = true
  server.child.kill('SIGKILL')
  await Promise.all(writers)

  server = await startServer()
  const check = await mysql.createConnection({ uri: databaseUrl })
  let missing = 0
  let wrongText = 0
  let revisionsWithoutAudit = 0
  let auditWithoutRevision = 0
  let unacknowledgedKept = 0
  try {
    for (let w = 0; w < WRITERS; w++) {
      const [revisions] = await check.query(
        'SELECT r.number, r.source FROM revisions r JOIN systems s ON s.id = r.system_id JOIN labs l ON l.id = s.lab_id WHERE l.slug = ? AND s.slug = ? ORDER BY r.number',
        [DEMO_LAB.slug, slug(w)],
      ) as [{ number: number, source: string }[], unknown]
      const [audits] = await check.query(
        "SELECT CAST(JSON_VALUE(a.detail, '$.number') AS UNSIGNED) AS number FROM audit_log a JOIN labs l ON l.id = a.lab_id WHERE l.slug = ? AND a.action = 'system.revise' AND JSON_VALUE(a.detail, '$.slug') = ?",
        [DEMO_LAB.slug, slug(w)],
      ) as [{ number: number }[], unknown]
      const byNumber = new Map(revisions.map(r => [Number(r.number), r.source]))
      const audited = new Set(audits.map(a => Number(a.number)))
      const mine = acks.filter(a => a.writer === w)
      for (const ack of mine) {
        if (!byNumber.has(ack.number)) missing++
        else if (byNumber.get(ack.number) !== ack.source) wrongText++
      }
      // Revision 1 was the creation ('system.create'); every later one is a save with its own audit line.
      for (const number of byNumber.keys()) if (number > 1 && !audited.has(number)) revisionsWithoutAudit++
      for (const number of audited) if (!byNumber.has(number)) auditWithoutRevision++
      const acknowledged = new Set(mine.map(a => a.number))
      for (const number of byNumber.keys()) if (number > 1 && !acknowledged.has(number)) unacknowledgedKept++
    }
    // And the restarted server answers again.
    const after = await fetch(`${server.base}/api/auth/login`, { method: 'POST', headers: headers(), body: JSON.stringify({ email: 'editor@demo.equipoise.test', password: DEMO_PASSWORD }) })
    if (!after.ok) throw new Error(`Signing in after the restart failed (${after.status})`)
  } finally {
    await check.end()
    server.child.kill()
  }

  const passed = missing === 0 && wrongText === 0 && revisionsWithoutAudit === 0 && auditWithoutRevision === 0
  const figures = {
    writers: WRITERS,
    killAfterMs: Math.round(killAfter),
    savesSent: sent,
    savesAcknowledged: acks.length,
    notAcknowledged: sent - acks.length,
    refusedBeforeKill: refused,
    unacknowledgedButWhole: unacknowledgedKept,
    acknowledgedMissing: missing,
    acknowledgedWithOtherText: wrongText,
    revisionsWithoutAudit,
    auditWithoutRevision,
    passed,
  }
  if (asJson) {
    console.log(JSON.stringify(figures))
  } else {
    say(`\nDurability: ${WRITERS} writers saving until kill -9 after ${figures.killAfterMs} ms`)
    say(`  saves sent ${sent}, acknowledged ${acks.length}, not acknowledged ${figures.notAcknowledged} (answered with an error before the kill: ${refused}; kept whole although unacknowledged: ${unacknowledgedKept})`)
    say(`  acknowledged but missing ${missing}, with other text ${wrongText}`)
    say(`  revisions without their audit line ${revisionsWithoutAudit}, audit lines without their revision ${auditWithoutRevision}`)
    say(`  ${passed ? 'PASSED' : 'FAILED'}`)
  }
  if (!passed) process.exitCode = 1
}

main().catch((error) => {
  const cause = (error as { cause?: unknown })?.cause
  console.error(`Durability check failed: ${error instanceof Error ? error.message : String(error)}${cause ? ` (${String(cause)})` : ''}`)
  process.exit(1)
})
