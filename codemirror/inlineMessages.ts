/**
 * Each diagnostic's message written in the text, in a block under the line it
 * concerns, so a chemist reads what is wrong without hovering. It follows the
 * lint state: rebuilt whenever the linter publishes, mapped through edits in
 * between.
 */
import { RangeSetBuilder, StateField, type EditorState } from '@codemirror/state'
import { Decoration, EditorView, WidgetType, type DecorationSet } from '@codemirror/view'
import { setDiagnosticsEffect, type Diagnostic } from '@codemirror/lint'

interface LineMessage {
  severity: Diagnostic['severity']
  message: string
}

class MessagesWidget extends WidgetType {
  constructor(readonly messages: readonly LineMessage[]) {
    super()
  }

  override eq(other: MessagesWidget): boolean {
    return (
      other.messages.length === this.messages.length &&
      other.messages.every((m, i) => m.message === this.messages[i]!.message && m.severity === this.messages[i]!.severity)
    )
  }

  toDOM(): HTMLElement {
    const block = document.createElement('div')
    block.className = 'cm-poise-messages'
    block.setAttribute('role', 'status')
    for (const { severity, message } of this.messages) {
      const row = block.appendChild(document.createElement('div'))
      row.className = `cm-poise-message cm-poise-message-${severity}`
      row.dataset.severity = severity
      row.textContent = message
    }
    return block
  }

  override ignoreEvent(): boolean {
    return false
  }
}

function buildMessages(state: EditorState, diagnostics: readonly Diagnostic[]): DecorationSet {
  const byLine = new Map<number, LineMessage[]>()
  for (const d of diagnostics) {
    const line = state.doc.lineAt(Math.min(d.from, state.doc.length))
    const messages = byLine.get(line.number) ?? []
    messages.push({ severity: d.severity, message: d.message })
    byLine.set(line.number, messages)
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
