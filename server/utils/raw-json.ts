/**
 * Answer with an object that carries large, already-serialised JSON values
 * (a solver result, a compiled model) without parsing and re-stringifying
 * them on the event loop.
 */
import { Readable } from 'node:stream'
import type { H3Event } from 'h3'
import { BINARY_ANSWER_TYPE, binaryAnswerChunks, type BinaryArray } from '../../shared/results/binary-answer'

/** `JSON.stringify({ ...head, [key]: JSON.parse(raw[key]) for each key })`, without the parse. */
export function jsonWithRaws(head: Record<string, unknown>, raw: Record<string, string>): string {
  let text = JSON.stringify(head).slice(0, -1)
  for (const [key, value] of Object.entries(raw)) {
    text += `${text.length > 1 ? ',' : ''}${JSON.stringify(key)}:${value}`
  }
  return `${text}}`
}

/** `JSON.stringify({ ...head, [key]: JSON.parse(rawJson) })`, without the parse. */
export function jsonWithRaw(head: Record<string, unknown>, key: string, rawJson: string): string {
  return jsonWithRaws(head, { [key]: rawJson })
}

export function sendJsonWithRaws(event: H3Event, head: Record<string, unknown>, raw: Record<string, string>): string {
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return jsonWithRaws(head, raw)
}

/** The same as UTF-8 bytes, around JSON values some of which are already bytes (a solver answer from its worker): no decoding, no parse. */
export function jsonBytesWithRaws(head: Record<string, unknown>, raw: Record<string, string | Uint8Array>): Buffer {
  const start = JSON.stringify(head).slice(0, -1)
  const parts: (Buffer | Uint8Array)[] = [Buffer.from(start)]
  let first = start.length <= 1
  for (const [key, value] of Object.entries(raw)) {
    parts.push(Buffer.from(`${first ? '' : ','}${JSON.stringify(key)}:`), typeof value === 'string' ? Buffer.from(value) : value)
    first = false
  }
  parts.push(Buffer.from('}'))
  return Buffer.concat(parts)
}

/** `jsonBytesWithRaws` with one raw value. */
export function jsonBytesWithRaw(head: Record<string, unknown>, key: string, rawJson: Uint8Array): Buffer {
  return jsonBytesWithRaws(head, { [key]: rawJson })
}

/** Answers with `head` plus raw JSON values, some already bytes; marked as JSON so it is compressed like any other answer. */
export function sendJsonBytesWithRaws(event: H3Event, head: Record<string, unknown>, raw: Record<string, string | Uint8Array>): Buffer {
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return jsonBytesWithRaws(head, raw)
}

/** Answers with `head` plus `key` holding the raw JSON; marked as JSON so it is compressed like any other answer. */
export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: string): string
export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: Uint8Array): Buffer
export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: string | Uint8Array): string | Buffer {
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return typeof rawJson === 'string' ? jsonWithRaw(head, key, rawJson) : jsonBytesWithRaw(head, key, rawJson)
}

/** Whether the request said it reads answers in the binary form (shared/results/binary-answer.ts). */
export function acceptsBinaryAnswer(event: H3Event): boolean {
  return String(getRequestHeader(event, 'accept') ?? '').split(',').some(t => t.split(';')[0].trim() === BINARY_ANSWER_TYPE)
}

/** Chunks smaller than this are copied together into blocks of this size before they are written. */
const BLOCK_BYTES = 1 << 20

/**
 * The chunks as blocks of about BLOCK_BYTES: a sweep's columns come as
 * thousands of small pieces (a slot of a chunk of rows), and a socket write
 * each would cost more than the copy. Pieces of a block's size or more go as
 * they are; at most one block is held beside them.
 */
export function* coalesced(chunks: Uint8Array[]): Generator<Uint8Array> {
  let block: Buffer | null = null
  let used = 0
  for (const chunk of chunks) {
    if (chunk.byteLength >= BLOCK_BYTES) {
      if (block && used) { yield block.subarray(0, used); block = null; used = 0 }
      yield chunk
      continue
    }
    if (block && used + chunk.byteLength > BLOCK_BYTES) { yield block.subarray(0, used); block = null; used = 0 }
    block ??= Buffer.allocUnsafe(BLOCK_BYTES)
    block.set(chunk, used)
    used += chunk.byteLength
  }
  if (block && used) yield block.subarray(0, used)
}

/**
 * Answers in the binary form: the head is `head` plus raw JSON values (as
 * `sendJsonBytesWithRaws`), the arrays follow it, written in blocks without
 * joining the whole answer on the event loop, and not compressed (see
 * binary-answer.ts).
 */
export function sendBinaryAnswer(event: H3Event, head: Record<string, unknown>, raw: Record<string, string | Uint8Array>, arrays: BinaryArray[]): Readable {
  const chunks = binaryAnswerChunks(jsonBytesWithRaws(head, raw), arrays)
  setResponseHeader(event, 'content-type', BINARY_ANSWER_TYPE)
  setResponseHeader(event, 'content-length', chunks.reduce((a, c) => a + c.byteLength, 0))
  appendResponseHeader(event, 'vary', 'accept')
  return Readable.from(coalesced(chunks), { objectMode: false })
}
