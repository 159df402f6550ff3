#!/usr/bin/env node
// The `equipoise` command: runs the bundle that `npm run build:cli` makes (see cli/main.ts).
import { existsSync } from 'node:fs'

const bundle = new URL('../dist/equipoise.mjs', import.meta.url)
if (!existsSync(bundle)) {
  console.error('The equipoise command is not built yet: run `npm run build:cli` in the Equipoise folder (npm install does it too).')
  process.exit(1)
}
await import(bundle.href)
