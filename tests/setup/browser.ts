/**
 * Opening pages in Chromium. `openPage()` for a signed-out visitor;
 * `openSignedIn()` puts a session cookie (from `signUp`/`signInAs`) in a
 * fresh browser context first. Both wait until Nuxt has hydrated.
 */
import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { createPage, getBrowser, url, waitForHydration } from '@nuxt/test-utils/e2e'
import type { BrowserContextOptions, Page } from 'playwright-core'
import { SESSION_COOKIE } from './accounts'

export const SCREENSHOT_DIR = resolve(import.meta.dirname, '../../test-results')

export function openPage(path: string): Promise<Page> {
  return createPage(path)
}

/** `device`: context options such as a phone's (`{ hasTouch: true, isMobile: true, viewport }`). */
export async function openSignedIn(path: string, cookie: string, device: BrowserContextOptions = {}): Promise<Page> {
  const browser = await getBrowser()
  const context = await browser.newContext(device)
  const value = cookie.replace(`${SESSION_COOKIE}=`, '')
  await context.addCookies([{ name: SESSION_COOKIE, value, url: url('/'), httpOnly: true, secure: true, sameSite: 'Lax' }])
  const page = await context.newPage()
  await page.goto(url(path))
  await waitForHydration(page, url(path), 'hydration')
  return page
}

/** Saves a full-page screenshot as test-results/NAME.png (git-ignored). */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  const path = resolve(SCREENSHOT_DIR, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}
