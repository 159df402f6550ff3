import { describe, expect, it } from 'vitest'
import { EditorState, type TransactionSpec } from '@codemirror/state'
import type { EditorView } from '@codemirror/view'
import type { Diagnostic } from '../../../shared/poise/diagnostics'
import { toEditorDiagnostics } from '../../../codemirror/editorDiagnostics'
import { compile } from '../../../shared/poise/index'

function diagnostic(from: number, to: number, extra: Partial<Diagnostic> = {}): Diagnostic {
  return {
    severity: 'error',
    code: 'P000',
    message: 'a message',
    range: { from, to, line: 1, column: from + 1, endLine: 1, endColumn: to + 1 },
    ...extra,
  }
}

/** Enough of an EditorView for a lint action: a state and a dispatch that applies to it. */
function fakeView(doc: string) {
  const view = {
    state: EditorState.create({ doc }),
    dispatch(spec: TransactionSpec) {
      view.state = view.state.update(spec).state
    },
  }
  return view
}

describe('compiler diagnostics in the editor', () => {
  it('clamps a range past the end of the document to the document', () => {
    const [d] = toEditorDiagnostics([diagnostic(40, 55)], 30)
    expect(d).toMatchObject({ from: 30, to: 30 })
  })

  it('clamps a negative start and an end before the start', () => {
    const [d] = toEditorDiagnostics([diagnostic(-3, -1)], 30)
    expect(d).toMatchObject({ from: 0, to: 0 })
  })

  it('keeps the severity, message and code', () => {
    const [error, warning] = toEditorDiagnostics(
      [diagnostic(0, 4, { message: 'left has 2 more O than right' }), diagnostic(5, 9, { severity: 'warning', code: 'P201', message: 'no cite' })],
      20,
    )
    expect(error).toMatchObject({ from: 0, to: 4, severity: 'error', message: 'left has 2 more O than right' })
    expect(warning).toMatchObject({ severity: 'warning', source: 'P201', message: 'no cite' })
  })

  it('offers a fix as an action that edits the text', () => {
    const doc = 'component Ca+2 total 1 mM'
    const fix = { label: 'write Ca^2+', from: 10, to: 14, insert: 'Ca^2+' }
    const [d] = toEditorDiagnostics([diagnostic(10, 14, { fixes: [fix] })], doc.length)
    expect(d!.actions!.map((a) => a.name)).toEqual(['write Ca^2+'])
    const view = fakeView(doc)
    d!.actions![0]!.apply(view as unknown as EditorView, d!.from, d!.to)
    expect(view.state.doc.toString()).toBe('component Ca^2+ total 1 mM')
  })

  it('offers the compiler\'s unit suggestion for ppm as an action that makes the file clean', () => {
    const doc = 'system "Hard water"\ncomponent H+ balance\ncomponent Ca^2+ total 40 ppm\n'
    const [d] = toEditorDiagnostics(compile(doc).diagnostics, doc.length)
    expect(d!.message).toContain('ppm is not a unit')
    expect(d!.actions!.map((a) => a.name)).toEqual(['write mg/L'])
    const view = fakeView(doc)
    d!.actions![0]!.apply(view as unknown as EditorView, d!.from, d!.to)
    expect(view.state.doc.toString()).toBe('system "Hard water"\ncomponent H+ balance\ncomponent Ca^2+ total 40 mg/L\n')
    expect(compile(view.state.doc.toString()).diagnostics.filter((x) => x.severity === 'error')).toEqual([])
  })

  it('applies a fix where the diagnostic has moved to after an edit above it', () => {
    const doc = 'component Ca+2 total 1 mM'
    const [d] = toEditorDiagnostics([diagnostic(10, 14, { fixes: [{ label: 'caret form', from: 10, to: 14, insert: 'Ca^2+' }] })], doc.length)
    const view = fakeView('# bath\n' + doc)
    d!.actions![0]!.apply(view as unknown as EditorView, 17, 21)
    expect(view.state.doc.toString()).toBe('# bath\ncomponent Ca^2+ total 1 mM')
  })
})
