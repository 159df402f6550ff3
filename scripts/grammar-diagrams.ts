/**
 * Writes grammar/diagrams.html: railroad diagrams generated from the parser
 * itself. The chevrotain diagram scripts and stylesheet are inlined so the
 * page opens offline (nothing is fetched from a CDN); grammar/diagrams.json
 * holds the same diagrams as static SVG for the app's reference page. Also rewrites the
 * generated tables of grammar/README.md (number limits, ion sizes).
 * Run: npx tsx scripts/grammar-diagrams.ts   (unit tests check both are current)
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { diagramsHtml, diagramsJson } from '../grammar/diagrams'
import { withGeneratedTables } from '../grammar/reference'

const target = fileURLToPath(new URL('../grammar/diagrams.html', import.meta.url))
writeFileSync(target, diagramsHtml())
console.log(`wrote ${target}`)
const json = fileURLToPath(new URL('../grammar/diagrams.json', import.meta.url))
writeFileSync(json, diagramsJson())
console.log(`wrote ${json}`)
const readme = fileURLToPath(new URL('../grammar/README.md', import.meta.url))
writeFileSync(readme, withGeneratedTables(readFileSync(readme, 'utf8')))
console.log(`updated ${readme}`)
