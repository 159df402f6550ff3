/**
 * A strict RFC 4180 reader for the tests only: it rejects what the standard
 * rejects (a quote inside an unquoted field, text after a closing quote, an
 * unterminated quote), so a test that reads our CSV back proves the quoting.
 */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = []
  let row: string[] = []
  let field = ''
  let i = 0
  let quoted = false
  let justClosed = false
  while (i < text.length) {
    const ch = text[i]
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"'
        i += 2
        continue
      }
      if (ch === '"') {
        quoted = false
        justClosed = true
        i++
        continue
      }
      field += ch
      i++
      continue
    }
    if (ch === ',') {
      row.push(field)
      field = ''
      justClosed = false
      i++
    } else if (ch === '\r' && text[i + 1] === '\n') {
      row.push(field)
      rows.push(row)
      row = []
      field = ''
      justClosed = false
      i += 2
    } else if (ch === '"') {
      if (field !== '') throw new Error(`quote inside an unquoted field at ${i}`)
      quoted = true
      i++
    } else {
      if (justClosed) throw new Error(`text after a closing quote at ${i}`)
      if (ch === '\n' || ch === '\r') throw new Error(`bare line break at ${i}`)
      field += ch
      i++
    }
  }
  if (quoted) throw new Error('unterminated quoted field')
  if (field !== '' || row.length > 0) throw new Error('the last line does not end in CRLF')
  return rows
}
