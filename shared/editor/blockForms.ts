/**
 * How each calculation kind's input is edited: a list of fields per kind, read by the block
 * form component. Field keys are paths into the engine input (`oscillators.count`), so an
 * engine issue path (`levels[1].energy`) points straight at the field or table cell.
 */
import { NUCLEI, registry } from '../thermo'

export type ScalarType = 'quantity' | 'integer' | 'number' | 'text'

export interface ColumnSpec {
  key: string
  label: string
  type: ScalarType
  optional?: boolean
  placeholder?: string
}

interface BaseField {
  /** Dotted path into the input, e.g. 'temperature' or 'oscillators.count'. */
  key: string
  label: string
  /** A short hint shown under the label. */
  hint?: string
  optional?: boolean
}

export type FieldSpec =
  | (BaseField & { type: ScalarType, placeholder?: string })
  | (BaseField & { type: 'select', options: { value: string | number, label: string }[] })
  /** A list of texts edited as one comma-separated line. */
  | (BaseField & { type: 'list', placeholder?: string })
  /** A nested engine input edited as JSON text. */
  | (BaseField & { type: 'json' })
  | (BaseField & {
    type: 'table', columns: ColumnSpec[], rowName: string, newRow: Record<string, unknown>, csvTarget?: 'levels' | 'lines'
    /**
     * The input key of the same list in its column form (`levelTable`, see shared/editor/levelTable.ts):
     * when the input holds that instead of the rows, the form shows a summary of it, not a row table.
     */
    levelTableKey?: string
  })

const temperature: FieldSpec = { key: 'temperature', label: 'Temperature', type: 'quantity', placeholder: '298.15 K', hint: "With its unit: '296 K', '25 °C' or '4.2 K'." }
const energyHint = 'Energy with its unit: cm⁻¹ (or cm-1), eV, hartree, kJ/mol, K, MHz, or a vacuum wavelength in nm…'
const symmetryOptions = [1, 2, 3, 4, 6, 12].map(value => ({ value, label: String(value) }))
const temperatureKinds = Object.entries(registry).filter(([, definition]) => definition.temperatureField).map(([kind, definition]) => ({ value: kind, label: definition.title }))

export const BLOCK_FORMS: Record<string, FieldSpec[]> = {
  levels: [
    temperature,
    { key: 'amount', label: 'Amount of substance', type: 'text', optional: true, placeholder: '1 mol', hint: 'Optional: gives expected particle counts per level.' },
    {
      key: 'levels', label: 'Levels', type: 'table', rowName: 'level', csvTarget: 'levels', levelTableKey: 'levelTable', hint: energyHint,
      newRow: { energy: '', degeneracy: 1 },
      columns: [
        { key: 'label', label: 'Label', type: 'text', optional: true },
        { key: 'energy', label: 'Energy', type: 'quantity', placeholder: '0 cm⁻¹' },
        { key: 'degeneracy', label: 'Degeneracy g', type: 'integer' },
      ],
    },
  ],
  vibration: [
    temperature,
    { key: 'energyZero', label: 'Energy zero', type: 'select', options: [{ value: 'groundState', label: 'Ground state (v = 0)' }, { value: 'wellBottom', label: 'Bottom of the well' }] },
    { key: 'maxQuantum', label: 'Highest quantum number v', type: 'integer', optional: true, hint: 'Optional: leave empty for the full ladder.' },
    {
      key: 'modes', label: 'Modes', type: 'table', rowName: 'mode', newRow: { wavenumber: '' },
      columns: [
        { key: 'label', label: 'Label', type: 'text', optional: true },
        { key: 'wavenumber', label: 'Wavenumber ω', type: 'quantity', placeholder: '2169.8 cm⁻¹' },
        { key: 'degeneracy', label: 'Degeneracy', type: 'integer', optional: true },
        { key: 'anharmonicity', label: 'Anharmonicity ωx', type: 'quantity', optional: true, placeholder: '13.3 cm⁻¹' },
      ],
    },
  ],
  rotation: [
    temperature,
    { key: 'rotationalConstant', label: 'Rotational constant B', type: 'quantity', placeholder: '1.9313 cm⁻¹' },
    { key: 'centrifugalDistortion', label: 'Centrifugal distortion D', type: 'quantity', optional: true, placeholder: '6.1e-6 cm⁻¹' },
    { key: 'symmetryNumber', label: 'Symmetry number σ', type: 'select', options: [{ value: 1, label: '1 (heteronuclear)' }, { value: 2, label: '2 (homonuclear)' }] },
    { key: 'nuclearSpinWeights.even', label: 'Nuclear-spin weight, even J', type: 'number', optional: true, hint: 'With weights, σ is implied and not divided again (12C16O2: even 1, odd 0).' },
    { key: 'nuclearSpinWeights.odd', label: 'Nuclear-spin weight, odd J', type: 'number', optional: true },
    { key: 'maxJ', label: 'Highest J', type: 'integer', optional: true, hint: 'Optional: leave empty to sum until the terms vanish.' },
  ],
  spin: [
    temperature,
    { key: 'nucleus', label: 'Nucleus', type: 'select', optional: true, options: Object.keys(NUCLEI).map(name => ({ value: name, label: name })), hint: 'Or leave empty and give γ and I below.' },
    { key: 'field', label: 'Magnetic field B₀', type: 'quantity', optional: true, placeholder: '9.4 T' },
    { key: 'larmorFrequency', label: 'Larmor frequency (instead of B₀)', type: 'quantity', optional: true, placeholder: '400 MHz' },
    { key: 'gyromagneticRatio', label: 'Gyromagnetic ratio γ (custom nucleus)', type: 'quantity', optional: true, placeholder: '2.6752e8 s^-1 T^-1' },
    { key: 'spinQuantumNumber', label: 'Spin quantum number I (custom nucleus)', type: 'text', optional: true, placeholder: '1/2' },
  ],
  microstates: [
    { key: 'oscillators.count', label: 'Oscillators N', type: 'integer', optional: true },
    { key: 'oscillators.quanta', label: 'Quanta Q', type: 'integer', optional: true },
  ],
  boltzmannPlot: [
    {
      key: 'lines', label: 'Measured lines', type: 'table', rowName: 'line', csvTarget: 'lines', hint: 'Upper-level energy with its unit; intensities in any consistent unit.',
      newRow: { upperEnergy: '', degeneracy: 1, intensity: 1 },
      columns: [
        { key: 'label', label: 'Label', type: 'text', optional: true },
        { key: 'upperEnergy', label: 'Upper energy', type: 'quantity', placeholder: '1000 cm⁻¹' },
        { key: 'degeneracy', label: 'g upper', type: 'number' },
        { key: 'intensity', label: 'Intensity I', type: 'number' },
        { key: 'uncertainty', label: 'σ(I)', type: 'number', optional: true },
        { key: 'lineStrength', label: 'A', type: 'number', optional: true },
      ],
    },
  ],
  thermochemistry: [
    temperature,
    { key: 'pressure', label: 'Pressure', type: 'quantity', optional: true, placeholder: '1 bar', hint: 'bar, mbar, atm, Pa, kPa, Torr, mmHg or psi.' },
    { key: 'molarMass', label: 'Molar mass', type: 'quantity', placeholder: '28.0134 g/mol', hint: 'In g/mol or kg/mol, or the mass of one molecule in u or Da.' },
    { key: 'shape', label: 'Shape', type: 'select', options: [{ value: 'atom', label: 'Atom' }, { value: 'linear', label: 'Linear molecule' }, { value: 'nonlinear', label: 'Nonlinear molecule' }] },
    { key: 'formula', label: 'Formula', type: 'text', optional: true, placeholder: 'H2O', hint: 'Optional: the number of vibrations is then checked against 3N − 5 (linear) or 3N − 6.' },
    { key: 'symmetryNumber', label: 'Symmetry number σ', type: 'select', optional: true, options: symmetryOptions, hint: 'Leave it to the nuclear-spin weights when you give them: they imply σ.' },
    { key: 'rotationalConstants', label: 'Rotational constants', type: 'list', optional: true, placeholder: '1.98958 cm⁻¹', hint: 'One (linear) or three (nonlinear), separated by commas.' },
    {
      key: 'electronicLevels', label: 'Electronic levels', type: 'table', rowName: 'electronic level', optional: true, newRow: { energy: '0 cm⁻¹', degeneracy: 1 },
      hint: 'The ground state first (energy 0) with its degeneracy, then any low-lying levels. A triplet ground state (O₂ X³Σg⁻) has g = 3; a doublet with a low spin-orbit level (NO X²Π) is two levels of g = 2 about 120 cm⁻¹ apart. Empty means one non-degenerate level.',
      columns: [
        { key: 'energy', label: 'Energy', type: 'quantity', placeholder: '0 cm⁻¹' },
        { key: 'degeneracy', label: 'Degeneracy g', type: 'integer' },
      ],
    },
    { key: 'nuclearSpin.treatment', label: 'Nuclear-spin statistics', type: 'select', optional: true, options: [{ value: 'equilibrium', label: 'Equilibrium (spin modifications interconvert)' }, { value: 'normal', label: 'Normal (frozen at the high-temperature ratio, e.g. n-H₂)' }], hint: 'For H₂, D₂ and other homonuclear species at low temperature; give the weights below.' },
    { key: 'nuclearSpin.weights.even', label: 'Spin weight, even J (linear)', type: 'number', optional: true, hint: 'H₂: even 1, odd 3; D₂: even 6, odd 3.' },
    { key: 'nuclearSpin.weights.odd', label: 'Spin weight, odd J (linear)', type: 'number', optional: true },
    { key: 'nuclearSpin.weights.ee', label: 'Spin weight, Ka Kc even even (nonlinear)', type: 'number', optional: true, hint: 'H₂O: ee 1, eo 3, oe 3, oo 1.' },
    { key: 'nuclearSpin.weights.eo', label: 'Spin weight, Ka Kc even odd', type: 'number', optional: true },
    { key: 'nuclearSpin.weights.oe', label: 'Spin weight, Ka Kc odd even', type: 'number', optional: true },
    { key: 'nuclearSpin.weights.oo', label: 'Spin weight, Ka Kc odd odd', type: 'number', optional: true },
    {
      key: 'vibrations', label: 'Vibrations', type: 'table', rowName: 'vibration', optional: true, newRow: { wavenumber: '' },
      hint: 'A degenerate mode once, with its degeneracy (a linear molecule’s bend: 2).',
      columns: [
        { key: 'wavenumber', label: 'Wavenumber', type: 'quantity', placeholder: '2329.9 cm⁻¹' },
        { key: 'degeneracy', label: 'Degeneracy', type: 'integer', optional: true },
      ],
    },
  ],
  sweep: [
    { key: 'kind', label: 'Calculation swept', type: 'select', options: temperatureKinds },
    { key: 'baseInput', label: 'Its input (JSON, temperature is swept)', type: 'json' },
    { key: 'start', label: 'From', type: 'quantity', placeholder: '50 K' },
    { key: 'stop', label: 'To', type: 'quantity', placeholder: '1000 K' },
    { key: 'points', label: 'Points', type: 'integer' },
    { key: 'spacing', label: 'Spacing', type: 'select', options: [{ value: 'linear', label: 'Linear' }, { value: 'logarithmic', label: 'Logarithmic' }] },
    { key: 'outputs', label: 'Outputs', type: 'list', placeholder: 'levels[1].fraction', hint: 'Result paths, separated by commas.' },
  ],
  solveTemperature: [
    { key: 'kind', label: 'Calculation', type: 'select', options: temperatureKinds },
    { key: 'baseInput', label: 'Its input (JSON, temperature is solved for)', type: 'json' },
    { key: 'output', label: 'Output', type: 'text', placeholder: 'levels[1].fraction' },
    { key: 'target', label: 'Target value', type: 'number' },
    { key: 'lower', label: 'Lowest temperature', type: 'quantity', placeholder: '10 K' },
    { key: 'upper', label: 'Highest temperature', type: 'quantity', placeholder: '2000 K' },
  ],
}

/**
 * Engine issues (path → message) that no field of the kind's form shows next to itself: issues
 * about the whole input, a combination of fields, or a level table's lists
 * (`levelTable.energies[12]`), which the block lists under its form.
 */
export function issuesOutsideFields(kind: string, errors: Record<string, string>): [string, string][] {
  const fields = BLOCK_FORMS[kind] ?? []
  return Object.entries(errors).filter(([path]) => !fields.some(field =>
    field.type === 'table' ? path === field.key || path.startsWith(`${field.key}[`) : path === field.key))
}

/** Reads a dotted path ('oscillators.count') from an input object. */
export function readPath(input: Record<string, unknown>, key: string): unknown {
  let value: unknown = input
  for (const part of key.split('.')) {
    if (value === null || typeof value !== 'object') return undefined
    value = (value as Record<string, unknown>)[part]
  }
  return value
}

/**
 * Returns a copy of the input with the path set, or removed when `value` is undefined (an
 * emptied optional field); parents left empty by a removal are removed too.
 */
export function writePath(input: Record<string, unknown>, key: string, value: unknown): Record<string, unknown> {
  const parts = key.split('.')
  const copy = structuredClone(input)
  let target: Record<string, unknown> = copy
  const parents: [Record<string, unknown>, string][] = []
  for (const part of parts.slice(0, -1)) {
    const next = target[part]
    if (next === null || typeof next !== 'object' || Array.isArray(next)) target[part] = {}
    parents.push([target, part])
    target = target[part] as Record<string, unknown>
  }
  const last = parts[parts.length - 1]!
  if (value === undefined) {
    delete target[last]
    for (let index = parents.length - 1; index >= 0; index--) {
      const [parent, part] = parents[index]!
      if (Object.keys(parent[part] as object).length === 0) delete parent[part]
      else break
    }
  }
  else target[last] = value
  return copy
}

const PLAIN_NUMBER = /^\s*[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?\s*$/i

/**
 * The value stored for a typed number: the number when the text is a plain number, otherwise
 * the text itself (kept so nothing typed is lost; the engine then names the problem).
 */
export function typedNumber(text: string): number | string | undefined {
  if (text.trim() === '') return undefined
  return PLAIN_NUMBER.test(text) ? Number(text) : text
}

/**
 * Rows pasted from a spreadsheet (tab-separated, one row a line) as cell texts. A single
 * value without tabs or line breaks is not a table paste and gives null.
 */
export function parsePastedRows(text: string): string[][] | null {
  const lines = text.replace(/\r\n?/g, '\n').replace(/\n+$/, '').split('\n')
  if (lines.length < 2 && !lines[0]!.includes('\t')) return null
  return lines.map(line => line.split('\t').map(cell => cell.trim()))
}
