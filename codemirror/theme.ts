/**
 * The editor's look in Equipoise's palette: paper and ink, one teal accent,
 * faults in red. Colours are the design tokens of the Tailwind theme, written
 * out because CodeMirror themes are plain CSS-in-JS.
 */
import { HighlightStyle } from '@codemirror/language'
import { EditorView } from '@codemirror/view'
import { tags } from '@lezer/highlight'

const palette = {
  ink: '#1b2230',
  inkSoft: '#5a6372',
  paper: '#f6f4ef',
  panel: '#ffffff',
  line: '#dcd8ce',
  accent: '#0e6b61',
  accentSoft: '#d7ece8',
  caution: '#a8550b',
  fault: '#b3261e',
}

export const poiseHighlightStyle = HighlightStyle.define([
  { tag: tags.lineComment, color: palette.inkSoft, fontStyle: 'italic' },
  { tag: tags.definitionKeyword, color: palette.accent, fontWeight: '600' },
  { tag: tags.keyword, color: palette.accent },
  { tag: tags.atom, color: palette.accent, fontStyle: 'italic' },
  { tag: tags.function(tags.name), color: palette.caution, fontWeight: '600' },
  { tag: tags.typeName, color: palette.ink, fontWeight: '500' },
  { tag: tags.number, color: '#1d4f91' },
  { tag: tags.unit, color: palette.inkSoft },
  { tag: tags.string, color: '#5b4a2e' },
  { tag: tags.labelName, color: palette.inkSoft },
  { tag: [tags.operator, tags.arithmeticOperator, tags.punctuation], color: palette.inkSoft },
  { tag: tags.invalid, color: palette.fault, textDecoration: 'underline wavy' },
])

export const poiseEditorTheme = EditorView.theme({
  '&': { backgroundColor: palette.panel, color: palette.ink, height: '100%', fontSize: '14px' },
  '&.cm-focused': { outline: `2px solid ${palette.accent}`, outlineOffset: '-2px' },
  '.cm-scroller': { fontFamily: "'JetBrains Mono', ui-monospace, monospace", lineHeight: '1.6' },
  '.cm-content': { caretColor: palette.ink, padding: '8px 0' },
  '.cm-cursor': { borderLeftColor: palette.ink },
  '.cm-gutters': { backgroundColor: palette.paper, color: palette.inkSoft, borderRight: `1px solid ${palette.line}` },
  '.cm-activeLine': { backgroundColor: '#faf9f5' },
  '.cm-activeLineGutter': { backgroundColor: palette.accentSoft, color: palette.ink },
  '&.cm-focused .cm-selectionBackground, .cm-selectionBackground, ::selection': { backgroundColor: palette.accentSoft },
  '.cm-lintRange-error': { backgroundImage: 'none', textDecoration: `underline wavy ${palette.fault}`, textUnderlineOffset: '3px' },
  '.cm-lintRange-warning': { backgroundImage: 'none', textDecoration: `underline wavy ${palette.caution}`, textUnderlineOffset: '3px' },
  '.cm-poise-messages': { padding: '2px 0 4px 1.5em', fontSize: '12.5px', lineHeight: '1.45' },
  '.cm-poise-message': { whiteSpace: 'pre-wrap', display: 'flex', flexWrap: 'wrap', alignItems: 'baseline', gap: '0 8px' },
  '.cm-poise-fix': {
    font: 'inherit',
    color: palette.accent,
    background: 'none',
    border: `1px solid ${palette.line}`,
    borderRadius: '3px',
    padding: '0 6px',
    cursor: 'pointer',
  },
  '.cm-poise-fix:hover': { backgroundColor: palette.accentSoft },
  '.cm-poise-fix:focus-visible': { outline: `2px solid ${palette.accent}`, outlineOffset: '1px' },
  '.cm-poise-message-error': { color: palette.fault },
  '.cm-poise-message-warning': { color: palette.caution },
  '.cm-poise-message-error::before': { content: '"error: "', fontWeight: '600' },
  '.cm-poise-message-warning::before': { content: '"warning: "', fontWeight: '600' },
  '.cm-tooltip': { backgroundColor: palette.panel, border: `1px solid ${palette.line}`, color: palette.ink },
  '.cm-tooltip-autocomplete > ul > li[aria-selected]': { backgroundColor: palette.accentSoft, color: palette.ink },
  '.cm-poise-hover': { padding: '6px 10px', fontSize: '13px', maxWidth: '28em', fontFamily: "Inter, ui-sans-serif, system-ui, sans-serif" },
  '.cm-poise-hover-title': { fontWeight: '600', marginBottom: '4px' },
  '.cm-poise-hover dl': { display: 'grid', gridTemplateColumns: 'auto 1fr', columnGap: '10px', margin: '0' },
  '.cm-poise-hover dt': { color: palette.inkSoft },
  '.cm-poise-hover dd': { margin: '0', fontVariantNumeric: 'tabular-nums' },
  '.cm-diagnostic-error': { borderLeftColor: palette.fault },
  '.cm-diagnostic-warning': { borderLeftColor: palette.caution },
  '.cm-diagnosticAction': { backgroundColor: palette.accent },
})
