/**
 * Writes grammar/diagrams.html: railroad diagrams generated from the parser
 * itself. The chevrotain diagram scripts and stylesheet are inlined so the
 * page opens offline (nothing is fetched from a CDN).
 * Run: npx tsx scripts/grammar-diagrams.ts   (a unit test checks it is current)
 */
import { writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { diagramsHtml } from '../grammar/diagrams'

const target = fileURLToPath(new URL('../grammar/diagrams.html', import.meta.url))
writeFileSync(target, diagramsHtml())
console.log(`wrote ${target}`)
