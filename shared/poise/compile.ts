/**
 * The compiler: statements → checks → the model the solver takes. Every
 * problem becomes a diagnostic; nothing here throws to the caller (index.ts
 * turns even an internal bug into a diagnostic).
 */
import type { Model, ModelComponent, ModelGas, ModelLimit, ModelMap, ModelMonteCarlo, ModelReaction, ModelSolid, ModelSpecies, ModelSweep, ModelTitration, ActivityModelName, ConstantKind } from './model'
import type { Diagnostic, SourceRange } from './diagnostics'
import { parseFormula, type Abbreviations, type ParsedFormula } from './formula'
import { compileAbbreviations } from './abbreviations'
import { molarMassOf } from './elements'
import { Reporter } from './reporter'
import { parseFile, type Statement, type Tok } from './statements'
import { checkComponent } from './components'
import { checkBalance, kindMismatch, logKFromConstant, logKUncertaintyFromConstant, resolveReactions, type Known, type PreparedReaction, type PreparedTerm, type ReactionStatement } from './reactions'
import { compileSweep } from './sweep'
import { compileMap } from './map'
import { compileLimit } from './limitStatement'
import { compileTitration } from './titration'
import { convert, unitInfo, UNIT_HINTS } from './units'
import { REFERENCE_TEMPERATURE_C, vantHoff } from './thermo'
import { checkRange, MAX_MONTE_CARLO_DRAWS, MAX_MONTE_CARLO_SEED, MAX_MONTE_CARLO_SOLVES, MIN_MONTE_CARLO_DRAWS } from './limits'
import { defaultIonSize, type IonSizeSource } from './ionSize'

export interface CompileOptions {
  /** Returns a library's source, or null when it (or that revision) does not exist. Synchronous. */
  resolveLibrary?: (name: string, revision: number | null) => { source: string; revision: number } | null
}

export interface PoiseSymbol {
  name: string
  /** `abbreviation`: a name a file gives a group of atoms (`Cit`), with `stands` the formula it stands for. */
  kind: 'component' | 'species' | 'solid' | 'gas' | 'abbreviation'
  elements: Record<string, number>
  charge: number
  molarMass: number | null
  logK: number | null
  definedAt: SourceRange
  /** Charged dissolved species: the ion size the extended Debye–Hückel model takes, Å, and where it comes from. */
  ionSize: { angstrom: number; source: IonSizeSource } | null
  /** Only for an abbreviation: the formula it stands for (`C6H5O7`). */
  stands?: string
}

export interface CompileResult { model: Model | null; diagnostics: Diagnostic[]; symbols: PoiseSymbol[] }

const MAX_LIBRARY_DEPTH = 8

/**
 * Reads the formulas of one file with its abbreviations: problems become
 * diagnostics; an abbreviation used above its definition is reported once
 * (P014); a name whose abbreviation line was refused is not reported again.
 */
function formulaReader(report: Reporter, abbreviations: Abbreviations, refused: ReadonlySet<string>) {
  const reportedEarly = new Set<string>()
  return (t: Tok): ParsedFormula | null => {
    const r = parseFormula(t.image, abbreviations)
    if (r.problem) {
      const p = r.problem
      const word = /^[A-Z][A-Za-z]*/.exec(t.image.slice(p.from))?.[0]
      if (p.code === 'P011' && word && refused.has(word)) return null
      const fixes = p.fixes?.map((insert) => ({ label: `write ${insert}`, from: t.from, to: t.to, insert }))
      report.error(p.code, p.message, { from: t.from + p.from, to: t.from + Math.max(p.to, p.from + 1) }, fixes)
      return null
    }
    for (const name of r.formula.abbreviations ?? []) {
      const defined = abbreviations.get(name)!
      if (defined.from < t.from || reportedEarly.has(name)) continue
      reportedEarly.add(name)
      const at = t.from + Math.max(0, t.image.indexOf(name))
      report.error('P014', `${name} is used before its abbreviation line (line ${report.lineOf(defined.from)}): move \`abbreviation ${name} = ${defined.formula}\` above its first use`, { from: at, to: at + name.length })
    }
    return r.formula
  }
}

interface LibraryContent { reactions: PreparedReaction[]; sources: Record<string, string>; libraries: { name: string; revision: number }[] }

/**
 * Libraries compiled once per text: the editor's checker compiles the file
 * at every keystroke, and its libraries seldom change. An entry is keyed by
 * the library's text and where it is used from (the chain of `use`, which
 * its messages name), and it records the library lookups its own `use`
 * lines made; it is used only while the resolver still answers those the
 * same way, so a new revision of a library it uses compiles it again.
 * Entries are shared and read only. Bounded: the least recently used goes.
 */
const LIBRARY_MEMO_ENTRIES = 32
type CompiledLibrary = CompileResult & { library: LibraryContent }
interface LibraryLookup { name: string; revision: number | null; got: { source: string; revision: number } | null }
const libraryMemo = new Map<string, { lib: CompiledLibrary; lookups: LibraryLookup[] }>()
const libraryMemoCounts = { hits: 0, compiles: 0 }

/** How often a library came from the memo and how often it was compiled (for tests and the benchmark). */
export function libraryMemoStats(): { hits: number; compiles: number } {
  return { ...libraryMemoCounts }
}

function compileLibrary(source: string, options: CompileOptions, stack: string[]): CompiledLibrary {
  const resolve = options.resolveLibrary!
  const key = `${stack.join('\u0000')}\u0001${source}`
  const hit = libraryMemo.get(key)
  if (hit && hit.lookups.every((l) => sameLibrary(resolve(l.name, l.revision), l.got))) {
    libraryMemo.delete(key)
    libraryMemo.set(key, hit)
    libraryMemoCounts.hits++
    return hit.lib
  }
  const lookups: LibraryLookup[] = []
  const recording: CompileOptions = {
    ...options,
    resolveLibrary: (name, revision) => {
      const found = resolve(name, revision)
      lookups.push({ name, revision, got: found ? { source: found.source, revision: found.revision } : null })
      return found
    },
  }
  const lib = compileSource(source, recording, stack)
  libraryMemoCounts.compiles++
  libraryMemo.set(key, { lib, lookups })
  if (libraryMemo.size > LIBRARY_MEMO_ENTRIES) libraryMemo.delete(libraryMemo.keys().next().value!)
  return lib
}

function sameLibrary(a: { source: string; revision: number } | null, b: { source: string; revision: number } | null): boolean {
  return a === b || (a !== null && b !== null && a.revision === b.revision && a.source === b.source)
}

export function compileSource(source: string, options: CompileOptions, stack: string[] = []): CompileResult & { library: LibraryContent } {
  const report = new Reporter(source)
  const parsed = parseFile(source)
  for (const p of parsed.problems) report.error(p.code, p.message, p, p.fixes)
  let incomplete = parsed.incomplete
  const st = parsed.statements
  const of = <K extends Statement['kind']>(kind: K) => st.filter((s): s is Extract<Statement, { kind: K }> => s.kind === kind)

  // system: required, once, first.
  const systems = of('system')
  if (systems.length === 0 && !parsed.problems.length) report.error('P003', 'a file starts with `system "TITLE"`: add it as the first line', { from: 0, to: 0 })
  if (systems.length > 0 && st[0] !== systems[0]) report.error('P003', '`system` must be the first statement of the file', systems[0]!.keyword)
  for (const dup of systems.slice(1)) report.error('P004', '`system` is given twice: keep one', dup.keyword)
  for (const kind of ['temperature', 'activity', 'ionicStrength', 'sweep', 'map', 'sampleVolume', 'titrate', 'uncertainty'] as const) {
    const word = kind === 'sampleVolume' ? 'sample volume' : null
    for (const dup of of(kind).slice(1)) report.error('P004', `\`${word ?? dup.keyword.image}\` is given twice: keep one (one ${word ?? dup.keyword.image} a file)`, dup.keyword)
  }

  let temperatureC = REFERENCE_TEMPERATURE_C
  const tStmt = of('temperature')[0]
  if (tStmt) {
    const q = tStmt.quantity
    const t = q.unit ? convert(q.value, q.unit.image, 'temperature') : null
    if (!q.unit) report.error('P050', `expected ${UNIT_HINTS.temperature} after ${q.number.image}`, q.number)
    else if (t === null) report.error('P050', `${q.unit.image} is not ${UNIT_HINTS.temperature}`, q.unit)
    else if (t <= -273.15) report.error('P081', 'a temperature must be above absolute zero', q.number)
    else if (checkRange(report, 'temperature', t, q.number)) temperatureC = t
  }
  const activity: ActivityModelName = of('activity')[0]?.model ?? 'ideal'
  let fixedIonicStrength: number | null = null
  const iStmt = of('ionicStrength')[0]
  if (iStmt) {
    const q = iStmt.quantity
    const info = q.unit ? unitInfo(q.unit.image) : null
    if (!q.unit || !info || info.dimension !== 'concentration') report.error('P050', `expected a molar concentration unit (mol/L, mmol/L, M) after ${q.number.image}`, q.unit ?? q.number)
    else if (q.value < 0) report.error('P052', 'an ionic strength cannot be negative', q.number)
    else if (checkRange(report, 'ionicStrength', q.value * info.factor, q.number)) fixedIonicStrength = q.value * info.factor
  }

  const abbreviationLines = compileAbbreviations(of('abbreviation'), report)
  const abbreviations = abbreviationLines.table
  const formulaOf = formulaReader(report, abbreviations, abbreviationLines.refused)

  const sources: Record<string, string> = {}
  // A cite of a source whose line did not parse is not reported again (nor one of any key, when that line named none).
  const brokenSources = parsed.brokenLines.filter((b) => b.keyword === 'source')
  const citesBroken = (key: string) => brokenSources.some((b) => b.name === null || b.name === key)
  for (const s of of('source')) {
    if (Object.prototype.hasOwnProperty.call(sources, s.key.image)) report.error('P031', `source ${s.key.image} is defined twice`, s.key)
    sources[s.key.image] = s.text
  }

  // use: libraries bring reactions and sources.
  const libraryReactions: PreparedReaction[] = []
  const libraries: { name: string; revision: number }[] = []
  for (const u of of('use')) {
    const rev = u.revision?.value ?? null
    if (rev !== null && (!Number.isInteger(rev) || rev < 1)) { report.error('P071', 'a revision is a whole number from 1', u.revision!.number); continue }
    if (!options.resolveLibrary) { report.error('P070', `libraries cannot be loaded here: "${u.name}" needs the lab's library store (open the file in the workbench)`, u.nameTok); incomplete = true; continue }
    if (stack.includes(u.name)) { report.error('P070', `library "${u.name}" uses itself (through ${stack.join(' → ')}): remove the loop`, u.nameTok); continue }
    if (stack.length >= MAX_LIBRARY_DEPTH) { report.error('P070', `libraries are nested too deeply at "${u.name}"`, u.nameTok); continue }
    const found = options.resolveLibrary(u.name, rev)
    if (!found) {
      const latest = rev !== null ? options.resolveLibrary(u.name, null) : null
      if (latest) report.error('P071', `library "${u.name}" has no revision ${rev} (its latest is ${latest.revision})`, u.revision!.number)
      else report.error('P070', `there is no library "${u.name}": check its name`, u.nameTok)
      incomplete = true
      continue
    }
    const lib = compileLibrary(found.source, options, [...stack, u.name])
    const errors = lib.diagnostics.filter((d) => d.severity === 'error')
    if (errors.length) {
      const e = errors[0]!
      report.error('P072', `library "${u.name}" has ${errors.length} error${errors.length > 1 ? 's' : ''}; first, line ${e.range.line}: ${e.message}`, u.nameTok)
      incomplete = true
      continue
    }
    libraries.push({ name: u.name, revision: found.revision }, ...lib.library.libraries)
    for (const r of lib.library.reactions) libraryReactions.push({ ...r, library: r.library ?? u.name })
    for (const [k, v] of Object.entries(lib.library.sources)) if (!(k in sources)) sources[k] = v
  }

  // components
  const components: ModelComponent[] = []
  const componentTok = new Map<string, Tok>()
  // Components whose line failed before its name was known: the names they may have meant, or (none known) any.
  const brokenComponents = new Set<string>(parsed.brokenLines.filter((b) => b.keyword === 'component' && b.name !== null).map((b) => b.name!))
  let unnamedBrokenComponent = false
  for (const c of of('component')) {
    const f = formulaOf(c.formula)
    if (!f) {
      incomplete = true
      const meant = parseFormula(c.formula.image, abbreviations).problem?.fixes ?? []
      brokenComponents.add(c.formula.image)
      for (const m of meant) brokenComponents.add(parseFormula(m, abbreviations).formula?.name ?? m)
      if (meant.length === 0) unnamedBrokenComponent = true
      continue
    }
    if (componentTok.has(f.name)) { report.error('P031', `${f.name} is declared as a component twice: keep one`, c.formula); continue }
    const m = checkComponent(c, f, report)
    componentTok.set(f.name, c.formula)
    if (m) components.push(m)
    else incomplete = true
  }
  const balances = balancesOf(components)
  for (const b of balances.slice(1)) report.error('P055', `only one component can be balance: ${balances[0]!.name} already is`, componentTok.get(b.name)!)

  // reactions
  // A name a broken component line may have declared counts as one: its line's error says enough.
  const isComponent = (name: string) => componentTok.has(name) || brokenComponents.has(name) || unnamedBrokenComponent
  const prepared: PreparedReaction[] = []
  for (const r of of('reaction')) {
    const p = prepareReaction(r, report, sources, isComponent, citesBroken, formulaOf)
    if (p) prepared.push(p)
    else incomplete = true
  }

  const width = components.length
  const known = new Map<string, Known>()
  components.forEach((c, j) => {
    const nu = new Array<number>(width).fill(0)
    nu[j] = 1
    known.set(c.name, { formation: { nu, logK: 0, dH: 0, weights: new Map() }, formula: { name: c.name, elements: c.elements, charge: c.charge, phase: c.phase, molarMass: c.molarMass }, line: c.line, byReaction: null })
  })
  const water = parseFormula('H2O').formula!
  known.set('H2O', { formation: { nu: new Array<number>(width).fill(0), logK: 0, dH: 0, weights: new Map() }, formula: water, line: 0, byReaction: null })
  for (const name of componentTok.keys()) {
    // A component that failed its checks still counts as known, so its reactions do not cascade into errors.
    if (!known.has(name)) known.set(name, { formation: { nu: new Array<number>(width).fill(0), logK: 0, dH: 0, weights: new Map() }, formula: water, line: 0, byReaction: null })
  }
  const resolution = resolveReactions(prepared, libraryReactions, known, components.map((c) => c.name), report, incomplete)
  for (const { reaction, message } of resolution.libraryRelations) {
    const useStmt = of('use').find((u) => u.name === reaction.library) ?? of('use')[0]
    if (useStmt) report.error('P060', `library "${reaction.library}" line ${reaction.line}: ${message}`, useStmt.nameTok)
  }
  // `fit` in a library: the library's constants are shared by every system that uses it, so a system never fits them in place.
  for (const u of of('use')) {
    const marked = resolution.used.filter((r) => r.library === u.name && r.fit)
    if (marked.length === 0) continue
    const lines = marked.map((r) => r.line).join(', ')
    report.warning('W111', `library "${u.name}" marks ${marked.length === 1 ? 'a constant' : `${marked.length} constants`} fit (line ${lines}), but a library's constants stay fixed in the systems that use it: to fit ${marked.length === 1 ? 'it' : 'one'} here, copy its reaction into this file with fit after the value (a reaction in the file takes the place of the library's)`, u.nameTok)
  }

  // warnings
  if (!incomplete) {
    const mentioned = new Set(prepared.flatMap((r) => [...r.left, ...r.right].map((t) => t.formula.name)))
    for (const lr of resolution.used) if (lr.library) for (const t of [...lr.left, ...lr.right]) mentioned.add(t.formula.name)
    // A charged spectator still counts where charges count: the charge balance and the ionic strength.
    const chargesCount = balancesOf(components).length > 0 || (activity !== 'ideal' && fixedIonicStrength === null)
    for (const c of components) {
      if (mentioned.has(c.name) || (c.charge !== 0 && chargesCount)) continue
      report.warning('W101', `component ${c.name} is used by no reaction and changes nothing here: remove it, or add the reactions it takes part in`, componentTok.get(c.name)!)
    }
  }
  const suppressed = new Set<string>()
  for (const s of of('solid')) {
    const f = formulaOf(s.formula)
    if (!f) continue
    if (f.phase !== 's') { report.error('P056', `suppressed applies to a solid, written with (s): ${f.name} is not one`, s.formula); continue }
    const k = known.get(f.name)
    if (!k || !k.byReaction) report.warning('W102', `${f.name} is suppressed but no reaction defines it: the line has no effect`, s.formula)
    suppressed.add(f.name)
  }
  // ion sizes: `ion-size F N Å` overrides the built-in table for the extended Debye–Hückel model.
  const ionSizes = new Map<string, number>()
  for (const s of of('ionSize')) {
    const f = formulaOf(s.formula)
    if (!f) continue
    const q = s.quantity
    const info = q.unit ? unitInfo(q.unit.image) : null
    if (!q.unit || !info || info.dimension !== 'length') { report.error('P050', q.unit ? `${q.unit.image} is not ${UNIT_HINTS.length}` : `expected ${UNIT_HINTS.length} after ${q.number.image}`, q.unit ?? q.number); continue }
    const angstrom = q.value * info.factor
    if (!checkRange(report, 'ionSize', angstrom, q.number)) continue
    if (f.phase !== 'aq') { report.error('P061', `ion sizes are for dissolved ions: ${f.name} is a ${f.phase === 's' ? 'solid' : 'gas'}`, s.formula); continue }
    if (ionSizes.has(f.name)) { report.error('P031', `the ion size of ${f.name} is given twice: keep one`, s.formula); continue }
    if (!known.has(f.name)) {
      if (!incomplete) report.error('P061', `${f.name} is no species of this system: check its name, or add the component or reaction that makes it`, s.formula)
      continue
    }
    if (f.charge === 0) report.warning('W108', `${f.name} carries no charge, so its activity coefficient does not depend on an ion size: this line has no effect`, s.formula)
    else if (activity !== 'debye-huckel' && !parsed.brokenLines.some((b) => b.keyword === 'activity')) report.warning('W108', `ion sizes are used only by \`activity debye-huckel\`; with ${activity} this line has no effect`, s.keyword)
    ionSizes.set(f.name, angstrom)
  }
  const ionSizeOf = (name: string, charge: number): { angstrom: number; source: IonSizeSource } | null => {
    if (charge === 0) return null
    const given = ionSizes.get(name)
    return given !== undefined ? { angstrom: given, source: 'file' } : defaultIonSize(name, charge)
  }
  if (activity === 'debye-huckel' && !incomplete) {
    const activityStmt = of('activity')[0]!
    const guessed = (name: string, charge: number, at: { from: number; to: number }) => {
      const size = ionSizeOf(name, charge)
      if (size?.source !== 'charge') return
      report.warning('W107', `${name} is not in the built-in ion-size table, so debye-huckel guesses ${size.angstrom} Å from its charge: give its size with \`ion-size ${name} N Å\``, at)
    }
    for (const c of components) if (c.phase === 'aq') guessed(c.name, c.charge, componentTok.get(c.name)!)
    for (const r of resolution.used) {
      const name = resolution.defines.get(r)!
      const f = known.get(name)!.formula
      if (f.phase !== 'aq') continue
      const term = [...r.left, ...r.right].find((t) => t.formula.name === name)!
      const useStmt = r.library ? of('use').find((u) => u.name === r.library) : null
      guessed(name, f.charge, r.library ? (useStmt?.nameTok ?? activityStmt.keyword) : term.tok)
    }
  }
  const hPlus = components.find((c) => c.name === 'H+')
  if (balances.length === 0 && hPlus && hPlus.mode === 'total') {
    report.warning('W104', 'no component is balance and H+ is given as a total: the pH follows from that proton total, not from electroneutrality. Write `component H+ balance` to let the charge balance set the pH', componentTok.get('H+')!)
  }
  const sweepStmt = of('sweep')[0]
  const withoutDH = resolution.used.filter((r) => r.dH === null)
  const mapStmt = of('map')[0]
  const mapsTemperature = mapStmt !== undefined && (mapStmt.x.variable === 'temperature' || mapStmt.y.variable === 'temperature')
  if (withoutDH.length > 0 && (Math.abs(temperatureC - REFERENCE_TEMPERATURE_C) > 1e-9 || sweepStmt?.variable === 'temperature' || mapsTemperature)) {
    const lines = withoutDH.map((r) => (r.library ? `${r.library}:${r.line}` : String(r.line))).join(', ')
    const at = sweepStmt?.variable === 'temperature' ? sweepStmt.keyword : mapsTemperature ? mapStmt!.keyword : tStmt!.keyword
    report.warning('W103', `${withoutDH.length} reaction${withoutDH.length > 1 ? 's have' : ' has'} no dH, so ${withoutDH.length > 1 ? 'their constants stay' : 'its constant stays'} at the 25 C value (line ${lines}): add dH to move ${withoutDH.length > 1 ? 'them' : 'it'} with temperature`, at)
  }

  let sweep: ModelSweep | null = null
  // With a component missing, a sweep check would only add confusing errors.
  if (sweepStmt && !incomplete) sweep = compileSweep(sweepStmt, components, report, abbreviations)
  let map: ModelMap | null = null
  if (mapStmt && !incomplete) map = compileMap(mapStmt, components, { sweep: sweepStmt, titrate: of('titrate')[0] }, report, abbreviations)
  let titration: ModelTitration | null = null
  if (!incomplete) {
    titration = compileTitration({ sample: of('sampleVolume')[0], titrants: of('titrant'), titrate: of('titrate')[0], sweep: sweepStmt }, components, known, report, abbreviations)
  }
  const limits: ModelLimit[] = []
  if (!incomplete) {
    for (const l of of('limit')) {
      const curve = titration?.values != null
      const limit = compileLimit(l, components, sweepStmt !== undefined || curve, report, abbreviations)
      if (limit) limits.push(limit)
    }
  }

  const monteCarlo = compileMonteCarlo(of('uncertainty')[0], sweep?.values.length ?? titration?.values?.length ?? null, resolution.used.some((r) => r.logKUncertainty !== null), report)

  const model = buildModel()
  const symbols = buildSymbols()
  const library: LibraryContent = { reactions: prepared, sources, libraries }
  const diagnostics = [...report.diagnostics].sort((a, b) => a.range.from - b.range.from)
  return { model: report.hasErrors ? null : model, diagnostics, symbols, library }

  function ionSizeFields(name: string, charge: number): Pick<ModelSpecies, 'ionSize' | 'ionSizeSource'> {
    const size = ionSizeOf(name, charge)
    return size ? { ionSize: size.angstrom, ionSizeSource: size.source } : {}
  }

  function buildModel(): Model {
    const species: ModelSpecies[] = []
    const solids: ModelSolid[] = []
    const gases: ModelGas[] = []
    components.forEach((c, j) => {
      if (c.phase !== 'aq') return
      const nu = new Array<number>(width).fill(0)
      nu[j] = 1
      species.push({ name: c.name, charge: c.charge, elements: { ...c.elements }, componentIndex: j, nu, logK: 0, logKRef: 0, dH: 0, line: c.line, reactionWeights: [], ...ionSizeFields(c.name, c.charge) })
    })
    const reactionIndex = new Map(resolution.used.map((r, i) => [r, i]))
    const reactionWeights = (weights: Map<PreparedReaction, number>) =>
      [...weights].map(([r, weight]) => ({ reaction: reactionIndex.get(r)!, weight })).sort((a, b) => a.reaction - b.reaction)
    for (const r of resolution.used) {
      const name = resolution.defines.get(r)!
      const k = known.get(name)!
      const f = k.formula
      const formation = { nu: k.formation.nu, logK: vantHoff(k.formation.logK, k.formation.dH, temperatureC), logKRef: k.formation.logK, dH: k.formation.dH, line: r.line, reactionWeights: reactionWeights(k.formation.weights) }
      if (f.phase === 's') solids.push({ name, elements: { ...f.elements }, suppressed: suppressed.has(name), ...formation })
      else if (f.phase === 'g') gases.push({ name, elements: { ...f.elements }, ...formation })
      else species.push({ name, charge: f.charge, elements: { ...f.elements }, componentIndex: null, ...formation, ...ionSizeFields(name, f.charge) })
    }
    const reactions: ModelReaction[] = resolution.used.map((r) => ({
      equation: `${sideText(r.left)} <=> ${sideText(r.right)}`,
      kind: r.kind, value: r.value, logK: r.logK, dH: r.dH, cite: r.cite,
      fit: r.fit && r.library === null, uncertainty: r.uncertainty, logKUncertainty: r.logKUncertainty,
      defines: resolution.defines.get(r)!, library: r.library, line: r.line,
    }))
    return {
      title: of('system')[0]?.title ?? '', temperatureC, refTemperatureC: REFERENCE_TEMPERATURE_C, activity, fixedIonicStrength,
      components, species, solids, gases, reactions, sweep, sources, libraries,
      ...(limits.length ? { limits } : {}),
      ...(titration ? { titration } : {}),
      ...(map ? { map } : {}),
      ...(monteCarlo ? { monteCarlo } : {}),
    }
  }

  function buildSymbols(): PoiseSymbol[] {
    const out: PoiseSymbol[] = []
    for (const a of abbreviations.values()) {
      out.push({ name: a.name, kind: 'abbreviation', elements: a.elements, charge: 0, molarMass: molarMassOf(a.elements), logK: null, definedAt: report.range(a.from, a.from + a.name.length), ionSize: null, stands: a.formula })
    }
    for (const c of components) {
      const t = componentTok.get(c.name)!
      out.push({ name: c.name, kind: 'component', elements: c.elements, charge: c.charge, molarMass: c.molarMass || null, logK: 0, definedAt: report.range(t.from, t.to), ionSize: c.phase === 'aq' ? ionSizeOf(c.name, c.charge) : null })
    }
    for (const r of resolution.used) {
      if (r.library) continue
      const name = resolution.defines.get(r)!
      const k = known.get(name)!
      const term = [...r.left, ...r.right].find((t) => t.formula.name === name)!
      const kind = k.formula.phase === 's' ? 'solid' : k.formula.phase === 'g' ? 'gas' : 'species'
      out.push({ name, kind, elements: k.formula.elements, charge: k.formula.charge, molarMass: k.formula.molarMass, logK: vantHoff(k.formation.logK, k.formation.dH, temperatureC), definedAt: report.range(term.tok.from, term.tok.to), ionSize: kind === 'species' ? ionSizeOf(name, k.formula.charge) : null })
    }
    return out
  }
}

/**
 * `uncertainty draws N [seed S]`: N from MIN_MONTE_CARLO_DRAWS to
 * MAX_MONTE_CARLO_DRAWS, N × points within MAX_MONTE_CARLO_SOLVES; a
 * warning when nothing would be drawn (no constant with a ±) or nothing
 * swept (a single solve takes the linear ±).
 */
function compileMonteCarlo(stmt: Extract<Statement, { kind: 'uncertainty' }> | undefined, points: number | null, anyUncertain: boolean, report: Reporter): ModelMonteCarlo | null {
  if (!stmt) return null
  const draws = stmt.draws.value
  if (!Number.isInteger(draws) || draws < MIN_MONTE_CARLO_DRAWS || draws > MAX_MONTE_CARLO_DRAWS) {
    report.error('P086', `draws is a whole number from ${MIN_MONTE_CARLO_DRAWS} to ${MAX_MONTE_CARLO_DRAWS} (fewer make the 2.5–97.5 % band mean little, more take long for bands that no longer move): write uncertainty draws 200`, stmt.draws.number)
    return null
  }
  const seed = stmt.seed?.value ?? 1
  if (!Number.isInteger(seed) || seed < 0 || seed > MAX_MONTE_CARLO_SEED) {
    report.error('P086', `a seed is a whole number from 0 to ${MAX_MONTE_CARLO_SEED}: write seed 7`, stmt.seed!.number)
    return null
  }
  if (points !== null && draws * points > MAX_MONTE_CARLO_SOLVES) {
    const most = Math.floor(MAX_MONTE_CARLO_SOLVES / points)
    report.error('P086', `${draws} draws of ${points} points are ${draws * points} solves, more than the ${MAX_MONTE_CARLO_SOLVES} one run may make: ${most >= MIN_MONTE_CARLO_DRAWS ? `use at most ${most} draws, or ` : ''}fewer points`, stmt.draws.number)
    return null
  }
  // A line with no effect leaves no trace in the model (a map's rows, say, never draw).
  if (points === null) { report.warning('W112', 'uncertainty draws applies to a sweep or a titration curve, not to a map; a single solve (or a dose) gives its ± by linear propagation: the line has no effect here', stmt.keyword); return null }
  if (!anyUncertain) { report.warning('W112', 'no constant carries a ± (write it after the value: pKa 4.76 ± 0.02), so every draw would be the same: the line has no effect', stmt.keyword); return null }
  return { draws, seed, line: report.lineOf(stmt.from) }
}

function balancesOf(components: ModelComponent[]): ModelComponent[] {
  return components.filter((c) => c.mode === 'balance')
}

function sideText(terms: PreparedTerm[]): string {
  return terms.map((t) => (t.coefficient === 1 ? t.formula.name : `${t.coefficient} ${t.formula.name}`)).join(' + ')
}

function prepareReaction(r: ReactionStatement, report: Reporter, sources: Record<string, string>, isComponent: (n: string) => boolean, citesBroken: (key: string) => boolean, formulaOf: (t: Tok) => ParsedFormula | null): PreparedReaction | null {
  let ok = true
  const side = (terms: ReactionStatement['left']): PreparedTerm[] => {
    const out: PreparedTerm[] = []
    for (const t of terms) {
      const f = formulaOf(t.formula)
      if (!f) { ok = false; continue }
      if (!(t.coefficient > 0) || !Number.isFinite(t.coefficient)) {
        report.error('P010', 'a coefficient must be a positive number', t.coefficientTok ?? t.formula)
        ok = false
        continue
      }
      if (!checkRange(report, 'coefficient', t.coefficient, t.coefficientTok ?? t.formula)) { ok = false; continue }
      out.push({ coefficient: t.coefficient, formula: f, tok: t.formula })
    }
    return out
  }
  const left = side(r.left)
  const right = side(r.right)
  if (!ok) return null
  if (!checkBalance(left, right, r, report)) return null
  const kind = r.constantKind.image as ConstantKind
  const mismatch = kindMismatch(kind, left, right, isComponent)
  if (mismatch) { report.error('P040', mismatch, r.constantKind); return null }
  const logK = logKFromConstant(kind, r.constantValue.value)
  if (logK === null || !Number.isFinite(logK)) { report.error('P041', `${kind} must be a positive, finite number (or write its log with logK)`, r.constantValue.number); return null }
  if (!checkRange(report, 'logK', logK, r.constantValue.number, { what: kind === 'logK' ? 'log K' : `log K (from ${kind} ${r.constantValue.number.image})` })) return null
  let uncertainty: number | null = null
  let logKUncertainty: number | null = null
  if (r.uncertainty) {
    const u = r.uncertainty.quantity
    const unitsOf = kind === 'logK' || kind === 'logbeta' || kind === 'logKsp' || kind === 'logKH' ? 'log units' : `${kind} units`
    if (!(u.value > 0) || !Number.isFinite(u.value)) {
      report.error('P042', `an uncertainty must be a positive number, the standard uncertainty in ${unitsOf}: write ${kind} ${r.constantValue.number.image} ± 0.05 (or +- 0.05), or leave the ± out when it is not known`, u.number)
      return null
    }
    const sigma = logKUncertaintyFromConstant(kind, r.constantValue.value, u.value)
    const what = kind === 'logK' ? 'the uncertainty of log K' : `the uncertainty of log K (from ${kind} ${r.constantValue.number.image} ± ${u.number.image})`
    if (sigma === null || !checkRange(report, 'logKUncertainty', sigma, u.number, { what })) return null
    uncertainty = u.value
    logKUncertainty = sigma
  }
  for (const f of r.fits.slice(1)) report.error('P004', 'fit is given twice: keep one', f)
  let dH: number | null = null
  for (const e of r.enthalpies.slice(1)) report.error('P004', 'dH is given twice: keep one', e.tok)
  const e = r.enthalpies[0]
  if (e) {
    const q = e.quantity
    const v = q.unit ? convert(q.value, q.unit.image, 'enthalpy') : null
    if (v === null) { report.error('P050', q.unit ? `${q.unit.image} is not ${UNIT_HINTS.enthalpy}` : `expected ${UNIT_HINTS.enthalpy} after ${q.number.image}`, q.unit ?? q.number); return null }
    if (!checkRange(report, 'enthalpy', v, q.number)) return null
    dH = v
  }
  for (const c of r.cites.slice(1)) report.error('P004', 'cite is given twice: keep one', c.tok)
  let cite: string | null = null
  const c = r.cites[0]
  if (c) {
    if (c.key) {
      if (Object.prototype.hasOwnProperty.call(sources, c.key.image)) cite = sources[c.key.image]!
      else if (!citesBroken(c.key.image)) {
        report.error('P034', `source ${c.key.image} is not defined: add \`source ${c.key.image} "full reference"\``, c.key)
        return null
      }
      // Else the source's own line is in error already; the reaction is still resolved, so nothing else cascades.
    } else cite = c.text
  } else {
    report.warning('W105', 'this constant has no cite: add cite "where it comes from" (a handbook, a paper, or "from memory")', r.constantKind)
  }
  return { left, right, kind, value: r.constantValue.value, logK, dH, cite, library: null, fit: r.fits.length > 0, uncertainty, logKUncertainty, line: report.lineOf(r.from), stmt: r }
}
