/**
 * An answer with typed arrays in it, as bytes: a JSON head in which each
 * typed array is a marker `{"$binary":"Float64Array","offset":o,"length":n}`,
 * followed by the arrays' own bytes, each starting on an 8-byte boundary so
 * the reader makes views on the received buffer instead of copies.
 *
 *   bytes 0–3   "EQB1"
 *   bytes 4–7   length of the JSON head in bytes (uint32, little-endian)
 *   head        UTF-8 JSON, then zero bytes up to a multiple of 8
 *   data        the arrays in marker order, each padded to a multiple of 8;
 *               `offset` counts from the start of the data
 *
 * Why bytes and not JSON: a sweep's numbers are 8 bytes each as they are
 * (a log10 in JSON is ~20 characters, and parsing it back costs more than the
 * solve), and the browser reads them without a parse. They are not
 * compressed: doubles of full precision shrink little (brotli's fastest
 * level gives ~1.2× on a sweep's columns for as much time as it saves on a
 * fast network), while the head is small.
 *
 * Little-endian throughout (every platform Node and the browsers run on).
 */

/** The media type of an answer in this form; a request that can read it says so in `Accept`. */
export const BINARY_ANSWER_TYPE = 'application/vnd.equipoise.binary-answer'

const MAGIC = 0x31425145 // "EQB1" read as little-endian uint32

export type BinaryArray = Float64Array | Float32Array | Uint32Array | Int32Array | Uint16Array | Uint8Array
const TYPES = { Float64Array, Float32Array, Uint32Array, Int32Array, Uint16Array, Uint8Array } as const
type TypeName = keyof typeof TYPES

interface Marker { $binary: TypeName, offset: number, length: number }

const pad8 = (n: number) => (n + 7) & ~7

/** One array written from several pieces in order, never joined in memory; read back as one array. */
export class PiecedArray {
  readonly length: number
  constructor(readonly pieces: Float64Array[]) {
    this.length = pieces.reduce((a, p) => a + p.length, 0)
  }
}

function typeName(v: unknown): TypeName | null {
  for (const name of Object.keys(TYPES) as TypeName[]) if (v instanceof TYPES[name]) return name
  return null
}

/**
 * The JSON head of `value` (typed arrays as markers) and the arrays, in
 * marker order. The head is JSON text to embed in a larger head (offsets
 * count from the start of the data, so they do not move).
 */
export function binaryParts(value: unknown): { head: string, arrays: BinaryArray[] } {
  const arrays: BinaryArray[] = []
  let offset = 0
  const head = JSON.stringify(value, function (_key, v: unknown) {
    if (v instanceof PiecedArray) {
      // Float64 pieces are multiples of 8 bytes: they follow each other with no padding.
      const marker: Marker = { $binary: 'Float64Array', offset, length: v.length }
      arrays.push(...v.pieces)
      offset += v.length * 8
      return marker
    }
    const name = typeName(v)
    if (!name) return v
    const array = v as BinaryArray
    const marker: Marker = { $binary: name, offset, length: array.length }
    arrays.push(array)
    offset += pad8(array.byteLength)
    return marker
  })
  return { head, arrays }
}

const zeros = new Uint8Array(8)

/** The bytes of an answer, as chunks to write one after the other (the arrays are not copied): a head (UTF-8 JSON) and its arrays. */
export function binaryAnswerChunks(head: Uint8Array, arrays: BinaryArray[]): Uint8Array[] {
  const start = new Uint8Array(8)
  const view = new DataView(start.buffer)
  view.setUint32(0, MAGIC, true)
  view.setUint32(4, head.byteLength, true)
  const chunks: Uint8Array[] = [start, head]
  const headPad = pad8(head.byteLength) - head.byteLength
  if (headPad) chunks.push(zeros.subarray(0, headPad))
  for (const array of arrays) {
    chunks.push(new Uint8Array(array.buffer, array.byteOffset, array.byteLength))
    const p = pad8(array.byteLength) - array.byteLength
    if (p) chunks.push(zeros.subarray(0, p))
  }
  return chunks
}

/** All the bytes of `value` as one array (tests, small answers). */
export function encodeBinaryAnswer(value: unknown): Uint8Array<ArrayBuffer> {
  const { head, arrays } = binaryParts(value)
  const chunks = binaryAnswerChunks(new TextEncoder().encode(head), arrays)
  const out = new Uint8Array(chunks.reduce((a, c) => a + c.byteLength, 0))
  let at = 0
  for (const c of chunks) { out.set(c, at); at += c.byteLength }
  return out
}

/** Whether `bytes` start like an answer in this form. */
export function isBinaryAnswer(bytes: ArrayBuffer | Uint8Array): boolean {
  const b = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes)
  return b.byteLength >= 8 && new DataView(b.buffer, b.byteOffset, 8).getUint32(0, true) === MAGIC
}

/**
 * The value back: typed arrays are views on `buffer` (not copies) when they
 * fall on their alignment, which they do unless the bytes were moved to an
 * odd offset. Throws a readable Error on bytes that are not such an answer.
 */
export function decodeBinaryAnswer<T = unknown>(buffer: ArrayBuffer, byteOffset = 0, byteLength = buffer.byteLength - byteOffset): T {
  if (byteLength < 8 || !isBinaryAnswer(new Uint8Array(buffer, byteOffset, byteLength))) throw new Error('The answer is not in the expected binary form.')
  const headLength = new DataView(buffer, byteOffset, 8).getUint32(4, true)
  if (8 + headLength > byteLength) throw new Error('The answer ends inside its head.')
  const head = new TextDecoder().decode(new Uint8Array(buffer, byteOffset + 8, headLength))
  const dataStart = byteOffset + 8 + pad8(headLength)
  const end = byteOffset + byteLength
  return JSON.parse(head, (_key, v: unknown) => {
    if (v === null || typeof v !== 'object' || typeof (v as Marker).$binary !== 'string') return v
    const { $binary: name, offset, length } = v as Marker
    const Type = TYPES[name]
    if (!Type || !Number.isInteger(offset) || !Number.isInteger(length) || offset < 0 || length < 0) throw new Error('The answer holds a malformed array.')
    const at = dataStart + offset
    if (at + length * Type.BYTES_PER_ELEMENT > end) throw new Error('The answer ends inside one of its arrays.')
    if (at % Type.BYTES_PER_ELEMENT === 0) return new Type(buffer, at, length)
    return new Type(buffer.slice(at, at + length * Type.BYTES_PER_ELEMENT))
  }) as T
}
