// A system's title read from its text and written into it, the way the language reads it.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { quoteTitle, titleOf, withTitle } from '../../../shared/poise/title'

const text = '# a rinse\nsystem   "Rinse \\"A\\" tank"\ncomponent H+ pH 7\n'

describe('system titles', () => {
  it('reads the title as the compiler does, escapes and all', () => {
    expect(titleOf(text)).toBe('Rinse "A" tank')
    expect(titleOf(text)).toBe(compile(text).model?.title)
    expect(titleOf('component H+ pH 7\n')).toBeNull()
    // A title in a comment is no title.
    expect(titleOf('# system "Not this"\ncomponent H+ pH 7\n')).toBeNull()
  })

  it('writes a title back so that it reads the same, whatever quotes or backslashes it holds', () => {
    for (const title of ['Copper \\ nickel', 'The "hot" bath', 'Two\nlines']) {
      const renamed = withTitle(text, title)
      expect(titleOf(renamed)).toBe(title.replace('\n', ' '))
      expect(renamed.split('\n')[0]).toBe('# a rinse')
      expect(renamed.split('\n').slice(2)).toEqual(text.split('\n').slice(2))
    }
    expect(withTitle('component H+ pH 7\n', 'New')).toBe('system "New"\ncomponent H+ pH 7\n')
    expect(quoteTitle('a"b\\c')).toBe('"a\\"b\\\\c"')
  })
})
