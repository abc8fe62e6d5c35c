/**
 * Quantities at the edge: a text such as "2143.3 cm⁻¹" is parsed once (mathjs) and turned
 * into an SI double. A unit is always required; a bare number is refused where a quantity is
 * expected. Parsed units are cached by their text, and "number unit" texts take a fast path
 * (parseFloat plus a cached factor), so long level lists convert without mathjs per level.
 *
 * The notation accepted is the one in papers and spectrometer software: superscript or hyphen
 * exponents (cm⁻¹, cm-1, as well as cm^-1 and 1/cm), µ or u for micro, Å, °C and °F. Messages
 * show units back in that notation (spectroscopicUnit).
 */
import { all, create } from 'mathjs'
import {
  ATOMIC_MASS_CONSTANT,
  AVOGADRO_CONSTANT,
  BOLTZMANN_CONSTANT,
  ELEMENTARY_CHARGE,
  HARTREE_ENERGY,
  MILLIMETRE_OF_MERCURY,
  PLANCK_CONSTANT,
  POUND_FORCE_PER_SQUARE_INCH,
  REDUCED_PLANCK_CONSTANT,
  SPEED_OF_LIGHT,
  STANDARD_ATMOSPHERE,
  THERMOCHEMICAL_CALORIE,
} from './constants'
import { inputError } from './errors'

const math = create(all!)
// mathjs defines the electronvolt with the CODATA 2010 charge; the SI 2019 value is exact.
math.createUnit('eV', { definition: `${ELEMENTARY_CHARGE} J`, prefixes: 'short' }, { override: true })
math.createUnit('cal', { definition: `${THERMOCHEMICAL_CALORIE} J`, prefixes: 'short' }, { override: true })
math.createUnit('Da', { definition: `${ATOMIC_MASS_CONSTANT} kg`, prefixes: 'short', aliases: ['u', 'amu'] }, { override: true })
math.createUnit('hartree', { definition: `${HARTREE_ENERGY} J`, aliases: ['Eh'] }, { override: true })
// mathjs rounds the torr and the millimetre of mercury to 133.322 Pa; both have exact definitions.
math.createUnit('Torr', { definition: `${STANDARD_ATMOSPHERE / 760} Pa`, prefixes: 'short', aliases: ['torr'] }, { override: true })
math.createUnit('mmHg', { definition: `${MILLIMETRE_OF_MERCURY} Pa` }, { override: true })
math.createUnit('psi', { definition: `${POUND_FORCE_PER_SQUARE_INCH} Pa` }, { override: true })
math.createUnit('G', { definition: '1e-4 T', prefixes: 'short', aliases: ['gauss'] }, { override: true })

const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹'
const SUPERSCRIPT_RUN = /([⁺⁻]?)([⁰¹²³⁴⁵⁶⁷⁸⁹]+)/g

/**
 * The unit as typed, rewritten for mathjs: superscript and hyphen exponents (cm⁻¹, cm-1) become
 * ^-1, µ (micro sign or Greek mu) becomes u, Å the ångström, °C and °F degC and degF, and a
 * middle dot a product.
 */
export function normalizeUnit(unitText: string): string {
  return unitText
    .trim()
    .replace(/[\u00B5\u03BC]/g, 'u')
    .replace(/[\u00C5\u212B]/g, 'angstrom')
    .replace(/°\s*C|℃/g, 'degC')
    .replace(/°\s*F|℉/g, 'degF')
    .replace(/[·⋅]/g, ' ')
    .replace(SUPERSCRIPT_RUN, (_all, sign: string, digits: string) => `^${sign === '⁻' ? '-' : ''}${[...digits].map((digit) => SUPERSCRIPT_DIGITS.indexOf(digit)).join('')}`)
    .replace(/([A-Za-z)])-(\d+)/g, '$1^-$2')
    .replace(/^1\s*\//, '/')
}

/**
 * A unit in the spectroscopists' notation for showing back: cm^-1 → cm⁻¹, uK → µK,
 * degC → °C, angstrom → Å.
 */
export function spectroscopicUnit(unitText: string): string {
  return normalizeUnit(unitText)
    .replace(/\^(-?)(\d+)/g, (_all, sign: string, digits: string) => `${sign ? '⁻' : ''}${[...digits].map((digit) => SUPERSCRIPT_DIGITS[Number(digit)]).join('')}`)
    .replace(/^\/(\w+)$/, '$1⁻¹')
    .replace(/\bu(?=(K|m|s|T|G|eV|Hz|mol|g)\b)/g, 'µ')
    .replace(/\bangstrom\b/g, 'Å')
    .replace(/\bdegC\b/g, '°C')
    .replace(/\bdegF\b/g, '°F')
}

/** The kinds of quantity the engine tells apart. */
export type Dimension =
  | 'temperature'
  | 'energy'
  | 'molar energy'
  | 'wavenumber'
  | 'frequency'
  | 'pressure'
  | 'magnetic field'
  | 'amount of substance'
  | 'mass'
  | 'molar mass'
  | 'length'
  | 'time'
  | 'gyromagnetic ratio'
  | 'dimensionless number'
  | 'other'

// mathjs base dimensions: MASS, LENGTH, TIME, CURRENT, TEMPERATURE, LUMINOUS_INTENSITY,
// AMOUNT_OF_SUBSTANCE, ANGLE, BIT. The angle exponent is ignored when classifying.
const DIMENSION_TABLE: Record<string, Dimension> = {
  '0,0,0,0,1,0,0,0': 'temperature',
  '1,2,-2,0,0,0,0,0': 'energy',
  '1,2,-2,0,0,0,-1,0': 'molar energy',
  '0,-1,0,0,0,0,0,0': 'wavenumber',
  '0,0,-1,0,0,0,0,0': 'frequency',
  '1,-1,-2,0,0,0,0,0': 'pressure',
  '1,0,-2,-1,0,0,0,0': 'magnetic field',
  '0,0,0,0,0,0,1,0': 'amount of substance',
  '1,0,0,0,0,0,0,0': 'mass',
  '1,0,0,0,0,0,-1,0': 'molar mass',
  '0,1,0,0,0,0,0,0': 'length',
  '0,0,1,0,0,0,0,0': 'time',
  '-1,0,1,1,0,0,0,0': 'gyromagnetic ratio',
  '0,0,0,0,0,0,0,0': 'dimensionless number',
}

/** What a unit text means: its dimension and the factor (and offset) to SI. */
interface UnitInfo {
  dimension: Dimension
  /** SI value of one unit (for units without an offset). */
  factor: number
  /** True for degC and degF: converted through mathjs each time. */
  hasOffset: boolean
  /** True if the unit text names hertz (a cyclic rather than angular rate). */
  namesHertz: boolean
  /** True if the unit carries radians. */
  hasAngle: boolean
}

/** A parsed quantity: the number as typed, its unit text, its SI value and its dimension. */
export interface Quantity {
  magnitude: number
  unit: string
  /** Value in SI base units (K, J, J/mol, m^-1, Hz, Pa, T, mol, kg, kg/mol, ...). */
  si: number
  dimension: Dimension
  namesHertz: boolean
  hasAngle: boolean
}

const unitCache = new Map<string, UnitInfo>()
const NUMBER_THEN_UNIT = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$/

function classify(dimensions: number[]): Dimension {
  return DIMENSION_TABLE[dimensions.slice(0, 8).map((power, index) => (index === 7 ? 0 : power)).join(',')] ?? 'other'
}

function unitInfo(unitText: string, path: string): UnitInfo {
  const cached = unitCache.get(unitText)
  if (cached) return cached
  let parsed
  try {
    parsed = math.unit(`1 ${unitText}`)
  } catch {
    inputError(path, `'${spectroscopicUnit(unitText)}' is not a unit the engine knows (examples: K, °C, cm⁻¹, eV, kJ/mol, MHz, nm, T, bar, Torr, mol, g/mol)`)
  }
  const units = parsed.units as Array<{ unit: { name: string; offset: number }; power: number }>
  const info: UnitInfo = {
    dimension: classify(parsed.dimensions as number[]),
    factor: parsed.value as number,
    hasOffset: units.some((part) => part.unit.offset !== 0),
    namesHertz: units.some((part) => part.unit.name === 'Hz'),
    hasAngle: (parsed.dimensions as number[])[7] !== 0,
  }
  if (unitCache.size < 10_000) unitCache.set(unitText, info)
  return info
}

function describeValue(value: unknown): string {
  if (typeof value === 'number') return `the bare number ${value}`
  if (value === null || value === undefined) return 'nothing'
  if (typeof value === 'string') return value.trim() === '' ? 'an empty text' : `'${value}'`
  return `a ${Array.isArray(value) ? 'list' : typeof value}`
}

/**
 * Parses "number unit" text into a Quantity. The unit is required: "298.15" alone is refused.
 * Throws EngineInputError naming `path` for anything that is not a number followed by a unit.
 */
export function parseQuantity(text: unknown, path: string, example = '298.15 K'): Quantity {
  if (typeof text !== 'string') {
    inputError(path, `expected a quantity with its unit as text, such as '${example}', got ${describeValue(text)}`)
  }
  const match = NUMBER_THEN_UNIT.exec(text)
  if (!match) {
    inputError(path, `expected a number followed by a unit, such as '${example}', got ${describeValue(text)}`)
  }
  const magnitude = Number.parseFloat(match[1]!)
  // "2143.3 1/cm" means per centimetre; mathjs reads "/cm" after a number.
  const unitText = normalizeUnit(match[2]!)
  if (unitText === '') {
    inputError(path, `a unit is required: write for example '${example}', not '${text.trim()}'`)
  }
  if (!Number.isFinite(magnitude)) inputError(path, `the number in '${text}' is too large`)
  const info = unitInfo(unitText, path)
  let si = magnitude * info.factor
  if (info.hasOffset) {
    if (info.dimension !== 'temperature') inputError(path, `the unit '${spectroscopicUnit(unitText)}' has an offset and can only stand alone as a temperature`)
    si = math.unit(`${match[1]} ${unitText}`).toNumber('K')
  }
  return { magnitude, unit: unitText, si, dimension: info.dimension, namesHertz: info.namesHertz, hasAngle: info.hasAngle }
}

function wrongKind(path: string, expected: string, example: string, quantity: Quantity): never {
  inputError(path, `expected ${expected} such as ${example}, got ${article(quantity.dimension)} ('${quantity.magnitude} ${spectroscopicUnit(quantity.unit)}')`)
}

function article(dimension: Dimension): string {
  if (dimension === 'other') return 'a quantity of another kind'
  return /^[aeiou]/.test(dimension) ? `an ${dimension}` : `a ${dimension}`
}

/**
 * Absolute temperature in K from "298.15 K", "25 degC" or "77 degF".
 * Zero and negative absolute temperatures are refused.
 */
export function toKelvin(text: unknown, path = 'temperature'): number {
  const quantity = parseQuantity(text, path, '298.15 K')
  if (quantity.dimension !== 'temperature') wrongKind(path, 'a temperature', "'298.15 K' or '25 °C'", quantity)
  if (!(quantity.si > 0)) inputError(path, `an absolute temperature must be above 0 K, got ${formatNumber(quantity.si)} K`)
  return quantity.si
}

/**
 * Energy per particle in J from any of: energy (J, eV, hartree), molar energy
 * (E = E_m / N_A), wavenumber (E = h c ν̃), frequency (E = h ν; rad/s as E = ħ ω), a
 * temperature equivalent in K (E = k T) or a vacuum wavelength (E = h c / λ; a wavelength
 * measured in air is shorter by the refractive index of air, about 1.0003). Source of the
 * relations: Atkins' Physical Chemistry, Fundamentals; the constants are the SI 2019 exact values.
 */
export function toJoules(text: unknown, path = 'energy'): number {
  return energyFromQuantity(parseQuantity(text, path, '2143.3 cm⁻¹'), path)
}

/** Energy conversion of an already parsed quantity (see toJoules). */
export function energyFromQuantity(quantity: Quantity, path: string): number {
  switch (quantity.dimension) {
    case 'energy':
      return quantity.si
    case 'molar energy':
      return quantity.si / AVOGADRO_CONSTANT
    case 'wavenumber':
      return quantity.si * PLANCK_CONSTANT * SPEED_OF_LIGHT
    case 'frequency':
      return quantity.si * (quantity.hasAngle ? REDUCED_PLANCK_CONSTANT : PLANCK_CONSTANT)
    case 'temperature':
      if (unitInfo(quantity.unit, path).hasOffset) {
        inputError(path, `a temperature-equivalent energy must be given in K (E = kT), not in ${quantity.unit}`)
      }
      return quantity.si * BOLTZMANN_CONSTANT
    case 'length':
      if (!(quantity.si > 0)) inputError(path, 'a wavelength must be above zero')
      return (PLANCK_CONSTANT * SPEED_OF_LIGHT) / quantity.si
    default:
      return wrongKind(path, 'an energy', "'2143.3 cm⁻¹', '0.36 eV', '12 kJ/mol', '400 MHz', '300 K' or a vacuum wavelength such as '532 nm'", quantity)
  }
}

/**
 * Factor turning a number in `unitText` into J per particle, for columnar level tables where
 * the unit is given once. Offset temperature units are refused.
 */
export function energyFactor(unitText: unknown, path = 'energyUnit'): number {
  if (typeof unitText !== 'string' || unitText.trim() === '') {
    inputError(path, `expected an energy unit such as 'cm⁻¹', 'eV', 'kJ/mol', 'MHz' or 'K', got ${describeValue(unitText)}`)
  }
  const quantity = parseQuantity(`1 ${unitText.trim()}`, path, 'cm⁻¹')
  if (quantity.dimension === 'length') {
    inputError(path, `a wavelength (${spectroscopicUnit(quantity.unit)}) is not proportional to energy, so it cannot be a column's unit: give the levels in an energy unit such as cm⁻¹ or eV`)
  }
  return energyFromQuantity(quantity, path)
}

/** Converts an energy in J to a wavenumber in cm⁻¹ (ν̃ = E / (h c), per cm). */
export function joulesToWavenumber(energy: number): number {
  return energy / (PLANCK_CONSTANT * SPEED_OF_LIGHT * 100)
}

/** Converts an energy in J to J/mol (E_m = N_A E). */
export function joulesToMolar(energy: number): number {
  return energy * AVOGADRO_CONSTANT
}

/** Pressure in Pa from "1 bar", "101.325 kPa", "1 atm", "760 Torr", "14.7 psi". Must be positive. */
export function toPascal(text: unknown, path = 'pressure'): number {
  const quantity = parseQuantity(text, path, '1 bar')
  if (quantity.dimension !== 'pressure') wrongKind(path, 'a pressure', "'1 bar' or '101.325 kPa'", quantity)
  if (!(quantity.si > 0)) inputError(path, 'a pressure must be above zero')
  return quantity.si
}

/** Magnetic flux density in T from "9.4 T", "500 mT" or "94 kG" (gauss, 10⁻⁴ T). Must be positive. */
export function toTesla(text: unknown, path = 'field'): number {
  const quantity = parseQuantity(text, path, '9.4 T')
  if (quantity.dimension !== 'magnetic field') wrongKind(path, 'a magnetic field', "'9.4 T' or '5000 G'", quantity)
  if (!(quantity.si > 0)) inputError(path, 'a magnetic field must be above zero')
  return quantity.si
}

/** Cyclic frequency in Hz from "400 MHz". Must be positive. */
export function toHertz(text: unknown, path = 'frequency'): number {
  const quantity = parseQuantity(text, path, '400 MHz')
  if (quantity.dimension !== 'frequency') wrongKind(path, 'a frequency', "'400 MHz'", quantity)
  if (!(quantity.si > 0)) inputError(path, 'a frequency must be above zero')
  return quantity.hasAngle ? quantity.si / (2 * Math.PI) : quantity.si
}

/** Atomic mass units a molar mass may be given in (the particle mass, M = m N_A). */
const ATOMIC_MASS_UNIT = /^(?:[kMm]?Da|u|amu)$/

/**
 * Molar mass in kg/mol from "39.948 g/mol" or "0.039948 kg/mol", or from a particle mass in
 * atomic mass units ("39.948 u", "39.948 Da", "66.5 kDa") through M = m N_A. A bare mass such
 * as "28 g" is refused: read as the mass of one particle it gives a silently wrong entropy.
 */
export function toKilogramsPerMole(text: unknown, path = 'molarMass'): number {
  const quantity = parseQuantity(text, path, '28.0134 g/mol')
  let value: number
  if (quantity.dimension === 'molar mass') value = quantity.si
  else if (quantity.dimension === 'mass' && ATOMIC_MASS_UNIT.test(quantity.unit)) value = quantity.si * AVOGADRO_CONSTANT
  else if (quantity.dimension === 'mass') {
    return inputError(path, `'${quantity.magnitude} ${spectroscopicUnit(quantity.unit)}' is a mass, not a molar mass: did you mean '${quantity.magnitude} ${spectroscopicUnit(quantity.unit)}/mol'? (A particle mass is accepted in u or Da.)`)
  } else return wrongKind(path, 'a molar mass', "'28.0134 g/mol' or '28.0134 u'", quantity)
  if (!(value > 0)) inputError(path, 'a molar mass must be above zero')
  return value
}

/**
 * Number of particles from "1 mol" (N = n N_A), from a plain count (1000 or "1e6"), or from
 * "1e6 particles"-free texts. Must be positive.
 */
export function toParticleCount(value: unknown, path = 'amount'): number {
  if (typeof value === 'number') {
    if (!(Number.isFinite(value) && value > 0)) inputError(path, `expected a positive number of particles or an amount such as '1 mol', got ${value}`)
    return value
  }
  if (typeof value === 'string' && /^\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*$/.test(value)) {
    return toParticleCount(Number.parseFloat(value), path)
  }
  const quantity = parseQuantity(value, path, '1 mol')
  if (quantity.dimension !== 'amount of substance') wrongKind(path, 'an amount of substance or a count', "'1 mol' or 1000", quantity)
  if (!(quantity.si > 0)) inputError(path, 'an amount must be above zero')
  return quantity.si * AVOGADRO_CONSTANT
}

/**
 * Gyromagnetic ratio in rad s^-1 T^-1. "2.675e8 s^-1 T^-1" and "rad/(s T)" are angular (γ, the
 * CODATA convention); a unit naming Hz, such as "42.577 MHz/T", is read as γ/2π.
 */
export function toGyromagneticRatio(text: unknown, path = 'gyromagneticRatio'): number {
  const quantity = parseQuantity(text, path, '2.6752218744e8 s^-1 T^-1')
  if (quantity.dimension !== 'gyromagnetic ratio') wrongKind(path, 'a gyromagnetic ratio', "'2.6752218744e8 s^-1 T^-1' or '42.577 MHz/T'", quantity)
  if (quantity.si === 0) inputError(path, 'a gyromagnetic ratio must not be zero')
  return quantity.namesHertz ? quantity.si * 2 * Math.PI : quantity.si
}


/** Whether a text is a number with a length unit: a wavelength given as an energy. */
export function isWavelengthText(text: string): boolean {
  const match = NUMBER_THEN_UNIT.exec(text)
  if (!match || match[2] === '') return false
  try {
    return unitInfo(normalizeUnit(match[2]!), '').dimension === 'length'
  } catch {
    return false
  }
}

/** A number for a warning, to `digits` significant digits, with powers of ten written out (6.022×10²³). */
export function messageNumber(value: number, digits = 3): string {
  const text = value.toPrecision(digits)
  const match = /^(-?[\d.]+)e([+-]\d+)$/.exec(text)
  return match ? `${match[1]}×10${Array.from(String(Number(match[2])), (character) => character === '-' ? '⁻' : SUPERSCRIPT_DIGITS[Number(character)] ?? character).join('')}` : text
}

/** Short human form of a number for messages. */
export function formatNumber(value: number): string {
  return Number.isInteger(value) ? String(value) : value.toPrecision(6).replace(/\.?0+(e|$)/, '$1')
}
