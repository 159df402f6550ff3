/**
 * The mail the local fake SMTP server kept (scripts/fake-smtp.mjs writes one
 * JSON file per message). Only a server started with NUXT_MAIL_CAPTURE_DIR —
 * development and tests — has any; in production the folder is unset.
 */
import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { CapturedMail } from '../../shared/types/mail'

/** The folder of captured mail, or null when the server does not capture mail. */
export function mailCaptureDir(): string | null {
  const dir = String((useRuntimeConfig().mail as { captureDir?: string }).captureDir || '')
  return dir || null
}

/** The newest captured messages first. */
export async function listCapturedMail(dir: string, limit = 200): Promise<CapturedMail[]> {
  const names = (await readdir(dir).catch(() => [] as string[])).filter((n) => n.endsWith('.json')).sort().reverse().slice(0, limit)
  const messages = await Promise.all(names.map(async (name) => {
    try {
      return JSON.parse(await readFile(join(dir, name), 'utf8')) as CapturedMail
    } catch {
      return null
    }
  }))
  return messages.filter((m): m is CapturedMail => m !== null)
}
