/**
 * Poise text for the benchmark: the 8-component / 60-species / 4-solid
 * plating-rinse system the speed targets name, and a generated 200-line
 * file for the compile figure. Constants are demo values (loosely after values
 * from memory), not data.
 */

const METALS = ['Cu', 'Zn', 'Ni'] as const

/** Charge suffix in caret form for a species of charge z. */
function charge(z: number): string {
  if (z === 0) return ''
  const sign = z > 0 ? '+' : '-'
  return Math.abs(z) === 1 ? `^${sign}` : `^${Math.abs(z)}${sign}`
}

function complexLines(metal: string, k: number): string[] {
  const lines: string[] = []
  for (let n = 1; n <= 4; n++) {
    lines.push(`reaction ${metal}^2+ + ${n} NH3 <=> ${metal}(NH3)${n === 1 ? '' : n}${charge(2)}    logbeta ${((2.4 + 0.2 * k) * n - 0.25 * n * n).toFixed(2)}`)
  }
  for (let n = 1; n <= 4; n++) {
    const z = 2 - n
    lines.push(`reaction ${metal}^2+ + ${n} H2O <=> ${metal}(OH)${n === 1 ? '' : n}${charge(z)} + ${n} H+    logK ${((-8 - k * 0.6) * n - 0.63 * n * (n - 1)).toFixed(2)}`)
  }
  for (let n = 1; n <= 3; n++) {
    lines.push(`reaction ${metal}^2+ + ${n} Cl- <=> ${metal}Cl${n === 1 ? '' : n}${charge(2 - n)}    logbeta ${((0.4 + 0.1 * k) * n).toFixed(2)}`)
  }
  lines.push(`reaction ${metal}^2+ + CO3^2- <=> ${metal}CO3    logbeta ${(5.0 + 0.3 * k).toFixed(2)}`)
  lines.push(`reaction ${metal}^2+ + HCO3- <=> ${metal}HCO3+    logK ${(1.6 + 0.2 * k).toFixed(2)}`)
  lines.push(`reaction ${metal}^2+ + 2 CO3^2- <=> ${metal}(CO3)2^2-    logbeta ${(8.5 + 0.4 * k).toFixed(2)}`)
  return lines
}

/** 8 components, 60 aqueous species, 4 solids. */
export function benchSystemSource(sweep: string | null): string {
  const lines = [
    'system "Benchmark: mixed-metal plating rinse with ammonia and carbonate"',
    'temperature 25 C',
    'activity davies',
    'component H+      balance',
    'component Cu^2+   total 0.5 mmol/L',
    'component Zn^2+   total 0.8 mmol/L',
    'component Ni^2+   total 0.3 mmol/L',
    'component NH3     total 5 mmol/L',
    'component CO3^2-  total 2 mmol/L',
    'component Cl-     total 3.2 mmol/L',
    'component Na+     total 6 mmol/L',
    'reaction H2O <=> H+ + OH-            pKw 14.00  dH 55.84 kJ/mol',
    'reaction NH4+ <=> NH3 + H+           pKa 9.24   dH 52.2 kJ/mol',
    'reaction HCO3- <=> CO3^2- + H+       pKa 10.33  dH 14.9 kJ/mol',
    'reaction H2CO3 <=> HCO3- + H+        pKa 6.35   dH 9.2 kJ/mol',
    'reaction Na+ + CO3^2- <=> NaCO3-     logbeta 1.27',
    'reaction Na+ + HCO3- <=> NaHCO3      logK -0.25',
    'reaction Na+ + Cl- <=> NaCl          logbeta -0.5',
    'reaction Na+ + H2O <=> NaOH + H+     logK -14.2',
    'reaction Ni^2+ + 5 NH3 <=> Ni(NH3)5^2+  logbeta 8.34',
    'reaction Ni^2+ + 6 NH3 <=> Ni(NH3)6^2+  logbeta 8.31',
    ...METALS.flatMap((m, k) => complexLines(m, k)),
    'reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH-   pKsp 19.66',
    'reaction Zn(OH)2(s) <=> Zn^2+ + 2 OH-   pKsp 16.5',
    'reaction Ni(OH)2(s) <=> Ni^2+ + 2 OH-   pKsp 15.2',
    'reaction ZnCO3(s) <=> Zn^2+ + CO3^2-    pKsp 10.0',
  ]
  if (sweep) lines.push(sweep)
  return lines.join('\n') + '\n'
}

/** About 200 lines: the bench system, its reactions repeated for more metals, and commented notes. */
export function twoHundredLineSource(): string {
  const more = ['Cd', 'Co', 'Mn', 'Fe', 'Mg', 'Ca', 'Sr', 'Ba', 'Pb']
  const lines = benchSystemSource(null).trimEnd().split('\n')
  more.forEach((m, k) => {
    lines.splice(10, 0, `component ${m}^2+   total ${0.1 + 0.01 * k} mmol/L`)
    lines.push(`# ${m}: demo constants`, ...complexLines(m, k + 3))
  })
  while (lines.length < 200) lines.push(`# note ${lines.length}: demo constants, not data`)
  return lines.slice(0, 200).join('\n') + '\n'
}
