// Types of scripts/fake-smtp.mjs for the TypeScript that imports it (tests' global setup).
import type { CapturedMail } from '../shared/types/mail'

export type { CapturedMail }

export interface FakeSmtp {
  port: number
  dir: string
  close(): Promise<void>
}

export function startFakeSmtp(options: { dir: string; port?: number }): Promise<FakeSmtp>
export function readMessage(raw: string, envelope: { from: string; to: string[] }): Omit<CapturedMail, 'id' | 'receivedAt'>
