/**
 * The demo lab: a plating shop's lab with one account per role, and the
 * example systems from examples/*.poise. Safe to run again: existing
 * accounts, the lab and systems already there are left alone.
 */
import { createHash } from 'node:crypto'
import { existsSync, readdirSync, readFileSync } from 'node:fs'
import { basename, join } from 'node:path'
import { and, eq } from 'drizzle-orm'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import type { Database } from './connect'
import * as tables from './schema'
import type { LabRole } from '../../shared/utils/roles'
import { starterSource } from '../../shared/utils/lab-schemas'
import { titleOf } from '../../shared/poise/title'
import { suggestSlug } from '../../shared/utils/slugs'

/** Local-only password of every demo account (documented in the README). */
export const DEMO_PASSWORD = 'equipoise-demo'
export const DEMO_LAB = { slug: 'demo', name: 'Demo plating lab' }

export const DEMO_ACCOUNTS: { email: string, name: string, role: LabRole | null, isAdmin: boolean }[] = [
  { email: 'owner@demo.equipoise.test', name: 'Olga Owner', role: 'owner', isAdmin: false },
  { email: 'editor@demo.equipoise.test', name: 'Emil Editor', role: 'editor', isAdmin: false },
  { email: 'reviewer@demo.equipoise.test', name: 'Rhea Reviewer', role: 'reviewer', isAdmin: false },
  { email: 'viewer@demo.equipoise.test', name: 'Victor Viewer', role: 'viewer', isAdmin: false },
  { email: 'admin@demo.equipoise.test', name: 'Ada Admin', role: null, isAdmin: true },
]

// The same scrypt hashing (default options) that nuxt-auth-utils uses in the server.
const hasher = new Hash(new Scrypt({}))

export interface ExampleSystem { slug: string, title: string, source: string }

/** Reads examples/*.poise: the title from the `system "…"` line, the address from the file name. */
export function readExampleSystems(folder: string): ExampleSystem[] {
  if (!existsSync(folder)) return []
  return readdirSync(folder)
    .filter((name) => name.endsWith('.poise'))
    .sort()
    .map((name) => {
      const source = readFileSync(join(folder, name), 'utf8')
      const slug = suggestSlug(basename(name, '.poise'))
      const title = titleOf(source) ?? basename(name, '.poise')
      return { slug, title, source }
    })
    .filter((example) => example.slug.length >= 2)
}

export async function seedDemo(db: Database, examplesFolder: string): Promise<{ createdLab: boolean, addedSystems: string[] }> {
  const ids: number[] = []
  for (const account of DEMO_ACCOUNTS) {
    const [existing] = await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, account.email))
    if (existing) {
      ids.push(existing.id)
      continue
    }
    const [inserted] = await db.insert(tables.users).values({
      email: account.email,
      name: account.name,
      isAdmin: account.isAdmin,
      passwordHash: await hasher.make(DEMO_PASSWORD),
    }).$returningId()
    ids.push(inserted!.id)
  }
  const ownerId = ids[0]!

  let createdLab = false
  let [lab] = await db.select({ id: tables.labs.id }).from(tables.labs).where(eq(tables.labs.slug, DEMO_LAB.slug))
  if (!lab) {
    const [inserted] = await db.insert(tables.labs).values({ ...DEMO_LAB, createdBy: ownerId }).$returningId()
    lab = inserted!
    createdLab = true
    for (const [i, account] of DEMO_ACCOUNTS.entries()) {
      if (account.role) await db.insert(tables.labMembers).values({ labId: lab.id, userId: ids[i]!, role: account.role })
    }
  }

  const examples = readExampleSystems(examplesFolder)
  const wanted = examples.length
    ? examples
    : [{ slug: 'nickel-rinse', title: 'Nickel rinse tank', source: starterSource('Nickel rinse tank') }]
  const addedSystems: string[] = []
  for (const example of wanted) {
    const [present] = await db.select({ id: tables.systems.id }).from(tables.systems)
      .where(and(eq(tables.systems.labId, lab.id), eq(tables.systems.slug, example.slug)))
    if (present) continue
    const [system] = await db.insert(tables.systems).values({ labId: lab.id, slug: example.slug, title: example.title, createdBy: ownerId }).$returningId()
    await db.insert(tables.revisions).values({
      systemId: system!.id,
      number: 1,
      parentId: null,
      source: example.source,
      sha256: createHash('sha256').update(example.source, 'utf8').digest('hex'),
      authorId: ownerId,
      message: 'Seeded from the examples',
    })
    addedSystems.push(example.slug)
  }
  return { createdLab, addedSystems }
}
