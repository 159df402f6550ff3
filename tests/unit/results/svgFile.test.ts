import { describe, expect, it } from 'vitest'
import { standaloneSvg, svgSize } from '../../../shared/results/svgFile'
import { diagramPrefsKey, parseDiagramPrefs, serializeDiagramPrefs } from '../../../shared/results/diagramPrefs'

describe('standaloneSvg', () => {
  it('adds the prolog, the namespace and a background the size of the diagram', () => {
    const file = standaloneSvg('<svg width="640" height="400" viewBox="0 0 640 400"><path d="M0 0"/></svg>', '#f6f4ef')
    expect(file.startsWith('<?xml version="1.0" encoding="UTF-8"?>')).toBe(true)
    expect(file).toContain('xmlns="http://www.w3.org/2000/svg"')
    expect(file).toContain('<rect x="0" y="0" width="640" height="400" fill="#f6f4ef"/><path d="M0 0"/>')
  })

  it('keeps a namespace that is already there, once', () => {
    const file = standaloneSvg('<svg xmlns="http://www.w3.org/2000/svg" width="10" height="20"></svg>')
    expect(file.match(/xmlns=/g)).toHaveLength(1)
  })
})

describe('svgSize', () => {
  it('reads width and height, else the viewBox, else a default', () => {
    expect(svgSize('<svg width="300" height="150">')).toEqual({ width: 300, height: 150 })
    expect(svgSize('<svg viewBox="0 0 800 500">')).toEqual({ width: 800, height: 500 })
    expect(svgSize('<svg>')).toEqual({ width: 640, height: 400 })
  })
})

describe('diagram preferences', () => {
  it('round-trips a kind and a component, per system', () => {
    expect(diagramPrefsKey('lab-a/rinse-tank')).toBe('equipoise:diagram:lab-a/rinse-tank')
    const raw = serializeDiagramPrefs({ kind: 'solubility', component: 'Cu^2+' })
    expect(parseDiagramPrefs(raw)).toEqual({ kind: 'solubility', component: 'Cu^2+' })
  })

  it('ignores what it cannot read', () => {
    expect(parseDiagramPrefs(null)).toEqual({})
    expect(parseDiagramPrefs('not json')).toEqual({})
    expect(parseDiagramPrefs('{"kind":"pie","component":3}')).toEqual({})
  })
})
