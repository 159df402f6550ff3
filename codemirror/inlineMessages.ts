/**
 * Each diagnostic's message written in the text, in a block under the line it
 * concerns, so a chemist reads what is wrong without hovering. It follows the
 * lint state: rebuilt whenever the linter publishes, mapped through edits in
 * between.
 */
import { RangeSetBuilder, StateField, type EditorState } from '@codemirror/state'
import { Decoration, EditorView, WidgetType, type DecorationSet } from '@codemirror/view'
import { forEachDiagnostic, setDiagnosticsEffect, type Action, type Diagnostic } from '@codemirror/lint'

/** Run a diagnostic's fix at the place the diagnostic has moved to since it was reported. */
function applyAction(view: EditorView, diagnostic: Diagnostic, action: Action) {
  let applied = false
  forEachDiagnostic(view.state, (d, from, to) => {
    if (d !== diagnostic || applied) return
    applied = true
    action.apply(view, from, to)
  })
}

class MessagesWidget extends WidgetType {
  constructor(readonly diagnostics: readonly Diagnostic[]) {
    super()
  }

  override eq(other: MessagesWidget): boolean {
    return other.diagnostics.length === this.diagnostics.length && other.diagnostics.every((d, i) => d === this.diagnostics[i])
  }

  toDOM(view: EditorView): HTMLElement {
    const block = document.createElement('div')
    block.className = 'cm-poise-messages'
    for (const diagnostic of this.diagnostics) {
      const row = block.appendChild(document.createElement('div'))
      row.className = `cm-poise-message cm-poise-message-${diagnostic.severity}`
      row.dataset.severity = diagnostic.severity
      row.appendChild(document.createElement('span')).textContent = diagnostic.message
      for (const action of diagnostic.actions ?? []) {
        const button = row.appendChild(document.createElement('button'))
        button.type = 'button'
        button.className = 'cm-poise-fix'
        button.textContent = action.name
        button.addEventListener('click', () => applyAction(view, diagnostic, action))
      }
    }
    return block
  }

  /** Clicks on a fix belong to the button; anywhere else the editor places the cursor as usual. */
  override ignoreEvent(event: Event): boolean {
    return event.target instanceof HTMLElement && event.target.closest('.cm-poise-fix') !== null
  }
}

function buildMessages(state: EditorState, diagnostics: readonly Diagnostic[]): DecorationSet {
  const byLine = new Map<number, Diagnostic[]>()
  for (const d of diagnostics) {
    const line = state.doc.lineAt(Math.min(d.from, state.doc.length))
    byLine.set(line.number, [...(byLine.get(line.number) ?? []), d])
  }
  const builder = new RangeSetBuilder<Decoration>()
  for (const lineNumber of [...byLine.keys()].sort((a, b) => a - b)) {
    const line = state.doc.line(lineNumber)
    builder.add(line.to, line.to, Decoration.widget({ widget: new MessagesWidget(byLine.get(lineNumber)!), block: true, side: 1 }))
  }
  return builder.finish()
}

export const inlineMessages = StateField.define<DecorationSet>({
  create: () => Decoration.none,
  update(messages, tr) {
    for (const effect of tr.effects) {
      if (effect.is(setDiagnosticsEffect)) return buildMessages(tr.state, effect.value)
    }
    return messages.map(tr.changes)
  },
  provide: (field) => EditorView.decorations.from(field),
})
