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

export function sendJsonWithRaw(event: H3Event, head: Record<string, unknown>, key: string, rawJson: string): string {
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return jsonWithRaw(head, key, rawJson)
}
