/**
 * Help where you write: the reference key (F1; no browser or editor binding
 * of its own on the page) and a link under the editor open the language
 * reference (`/reference`, grammar/README.md as a page) at the statement on
 * the cursor's line, in a new tab so the text being written stays in view.
 */
import type { EditorState, Extension } from '@codemirror/state'
import { EditorView, keymap, showPanel, type Panel } from '@codemirror/view'
import { lexLine } from './language'
import { REFERENCE_KEY, shortcutLabel } from './shortcuts'
import { referenceLink } from '../utils/referenceLink'

/** The statement keyword of the cursor's line (`component`), or null on a blank line, a comment or a line that starts with no statement word. */
export function statementAt(state: EditorState, pos: number = state.selection.main.head): string | null {
  const first = lexLine(state.doc.lineAt(pos).text)[0]
  return first?.role === 'statement' ? first.image : null
}

/** Where the reference opens for the cursor's line. */
export function referenceAt(state: EditorState): string {
  return referenceLink(statementAt(state))
}

function openReference(view: EditorView): boolean {
  window.open(referenceAt(view.state), '_blank', 'noopener')
  return true
}

function referencePanel(view: EditorView): Panel {
  const dom = document.createElement('div')
  dom.className = 'cm-poise-reference'
  const link = dom.appendChild(document.createElement('a'))
  link.target = '_blank'
  link.rel = 'noopener'
  link.dataset.testid = 'reference-link'
  const key = dom.appendChild(document.createElement('kbd'))
  key.textContent = shortcutLabel(REFERENCE_KEY)
  const show = (state: EditorState) => {
    const keyword = statementAt(state)
    link.href = referenceLink(keyword)
    link.textContent = keyword ? `Reference: ${keyword}` : 'Language reference'
  }
  show(view.state)
  return {
    dom,
    update: (update) => {
      if (update.selectionSet || update.docChanged) show(update.state)
    },
  }
}

/** The reference key and the link panel under the editor. */
export function poiseReference(): Extension {
  return [
    keymap.of([{ key: REFERENCE_KEY, preventDefault: true, run: openReference }]),
    showPanel.of(referencePanel),
    EditorView.baseTheme({
      '.cm-poise-reference': { display: 'flex', gap: '0.5rem', alignItems: 'center', justifyContent: 'flex-end', padding: '2px 8px', fontSize: '0.8rem' },
      '.cm-poise-reference kbd': { fontFamily: 'inherit', opacity: '0.7' },
    }),
  ]
}
