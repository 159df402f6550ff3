/**
 * Answer with an object that carries a large, already-serialised JSON value
 * (a solver result) without parsing and re-stringifying it on the event loop.
 */
import type { H3Event } from 'h3'

/** `JSON.stringify({ ...head, [key]: JSON.parse(rawJson) })`, without the parse. */
export function jsonWithRaw(head: Record<string, unknown>, key: string, rawJson: string): string {
  const start = JSON.stringify(head).slice(0, -1)
  return `${start}${start.length > 1 ? ',' : ''}${JSON.stringify(key)}:${rawJson}}`
}

/** The same as UTF-8 bytes, around JSON that is already bytes (a solver answer from its worker): no decoding, no parse. */
export function jsonBytesWithRaw(head: Record<string, unknown>, key: string, rawJson: Uint8Array): Buffer {
  const start = JSON.stringify(head).slice(0, -1)
  return Buffer.concat([Buffer.from(`${start}${start.length > 1 ? ',' : ''}${JSON.stringify(key)}:`), rawJson, Buffer.from('}')])
}

/** Answers with `head` plus `key` holding the raw JSON; marked as JSON so it is compressed like any other answer. */
export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: string): string
export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: Uint8Array): Buffer
export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: string | Uint8Array): string | Buffer {
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return typeof rawJson === 'string' ? jsonWithRaw(head, key, rawJson) : jsonBytesWithRaw(head, key, rawJson)
}
