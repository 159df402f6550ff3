#!/usr/bin/env node
// A stand-in mail server for development and tests: it accepts SMTP on
// loopback only and keeps each message as a JSON file (from, to, subject,
// text, html) in a folder, where /admin/mail and the tests read it. Nothing
// is ever delivered anywhere. Run alone: `node scripts/fake-smtp.mjs [dir]`
// prints its port; scripts/serve.mjs and the tests' global setup import
// startFakeSmtp() instead.
import { randomBytes } from 'node:crypto'
import { mkdirSync, renameSync, writeFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { SMTPServer } from 'smtp-server'

/** Decodes `=?UTF-8?B?…?=` and `=?UTF-8?Q?…?=` words of a header (RFC 2047). */
function decodeHeaderWords(value) {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([bqBQ])\?([^?]*)\?=/g, (_, _charset, kind, text) => kind.toUpperCase() === 'B'
      ? Buffer.from(text, 'base64').toString('utf8')
      : Buffer.from(decodeQuotedPrintable(text.replace(/_/g, ' ')), 'latin1').toString('utf8'))
}

/** Quoted-printable to the bytes it stands for, as a latin1 string (RFC 2045 §6.7). */
function decodeQuotedPrintable(text) {
  return text.replace(/=\r?\n/g, '').replace(/=([0-9A-Fa-f]{2})/g, (_, hex) => String.fromCharCode(parseInt(hex, 16)))
}

/** Splits a MIME entity into lower-cased headers (folded lines joined) and its body. */
function splitEntity(raw) {
  const end = raw.search(/\r?\n\r?\n/)
  const head = end === -1 ? raw : raw.slice(0, end)
  const body = end === -1 ? '' : raw.slice(end).replace(/^\r?\n\r?\n/, '')
  const headers = {}
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':')
    if (colon > 0) headers[line.slice(0, colon).trim().toLowerCase()] = line.slice(colon + 1).trim()
  }
  return { headers, body }
}

function decodeBody(body, encoding = '') {
  const kind = encoding.toLowerCase()
  if (kind === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8')
  if (kind === 'quoted-printable') return Buffer.from(decodeQuotedPrintable(body), 'latin1').toString('utf8')
  return Buffer.from(body, 'latin1').toString('utf8')
}

/** Collects the text/plain and text/html parts of a message, walking multiparts. */
function collectParts(raw, into) {
  const { headers, body } = splitEntity(raw)
  const type = headers['content-type'] ?? 'text/plain'
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1]
  if (/^multipart\//i.test(type) && boundary) {
    const pieces = body.split(`--${boundary}`).slice(1)
    for (const piece of pieces) {
      if (piece.startsWith('--')) break
      collectParts(piece.replace(/^\r?\n/, ''), into)
    }
    return headers
  }
  const decoded = decodeBody(body, headers['content-transfer-encoding']).replace(/\r\n/g, '\n').replace(/\n$/, '')
  if (/^text\/html/i.test(type)) into.html ??= decoded
  else if (/^text\/plain/i.test(type)) into.text ??= decoded
  return headers
}

/** The stored form of one raw message as received. */
export function readMessage(raw, envelope) {
  const parts = {}
  const headers = collectParts(raw, parts)
  return {
    from: envelope.from,
    to: envelope.to,
    subject: decodeHeaderWords(headers.subject ?? ''),
    text: parts.text ?? '',
    html: parts.html ?? null,
  }
}

/**
 * Starts the fake server on 127.0.0.1 (port 0: a free one chosen by the
 * system, so checkouts side by side do not collide). Resolves with its port
 * and a close() function.
 */
export function startFakeSmtp({ dir, port = 0 }) {
  const folder = resolve(dir)
  mkdirSync(folder, { recursive: true })
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    // The biggest mail the app sends is a few kilobytes; refuse anything absurd.
    size: 1024 * 1024,
    onData(stream, session, done) {
      const chunks = []
      stream.on('data', (chunk) => chunks.push(chunk))
      stream.on('end', () => {
        try {
          const envelope = {
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
          }
          const receivedAt = new Date()
          const id = `${receivedAt.getTime()}-${randomBytes(4).toString('hex')}`
          const message = { id, receivedAt: receivedAt.toISOString(), ...readMessage(Buffer.concat(chunks).toString('latin1'), envelope) }
          // Written aside, then renamed: a reader never sees half a message.
          writeFileSync(join(folder, `${id}.json.part`), JSON.stringify(message, null, 2))
          renameSync(join(folder, `${id}.json.part`), join(folder, `${id}.json`))
          done()
        } catch (error) {
          done(error)
        }
      })
    },
  })
  return new Promise((ready, fail) => {
    server.once('error', fail)
    server.listen(port, '127.0.0.1', () => {
      const address = server.server.address()
      ready({
        port: typeof address === 'object' && address ? address.port : port,
        dir: folder,
        close: () => new Promise((closed) => server.close(() => closed(undefined))),
      })
    })
  })
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const dir = process.argv[2] ?? resolve(fileURLToPath(import.meta.url), '../../.data/mail')
  const { port } = await startFakeSmtp({ dir })
  console.log(`Fake SMTP on 127.0.0.1:${port}, keeping mail in ${dir}`)
}
