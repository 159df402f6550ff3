/**
 * zod compiles fast object parsers with `new Function` when it may; to find
 * out, it tries one, which the Content-Security-Policy (no 'unsafe-eval',
 * nuxt.config.ts) refuses and reports as a violation. Tell it up front to
 * parse without compiling in the browser.
 */
import { z } from 'zod'

export default defineNuxtPlugin({
  name: 'zod-jitless',
  enforce: 'pre',
  setup() {
    z.config({ jitless: true })
  },
})
