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

/**
 * Sideways scroll of the page as it is now: null when nothing is wider than
 * the window, else a sentence with the page's width and the outermost
 * elements sticking out on the right (to say where to look).
 */
export async function sidewaysOverflow(page: Page): Promise<string | null> {
  const { scrollWidth, innerWidth, wide } = await page.evaluate(() => ({
    scrollWidth: document.documentElement.scrollWidth,
    innerWidth: window.innerWidth,
    wide: [...document.querySelectorAll('body *')]
      .filter((el) => el.getBoundingClientRect().right > window.innerWidth + 1 && !(el.parentElement && el.parentElement.getBoundingClientRect().right > window.innerWidth + 1))
      .slice(0, 3)
      .map((el) => `${el.tagName.toLowerCase()}.${[...el.classList].join('.')}`),
  }))
  return scrollWidth > innerWidth ? `scrolls sideways (${scrollWidth}px wide in ${innerWidth}px; sticking out: ${wide.join(', ')})` : null
}
