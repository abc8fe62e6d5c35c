/**
 * What every number in a kind's result is, in words: a label, the trade's symbol and the unit
 * the engine stores it in, for each field of each kind's result. The block view, the record PDF,
 * the CSV and the record comparison (`describeResultQuantity`) all name result numbers from here.
 */

/** Context a label or unit may depend on (a level table's energy unit, the microstate model). */
export interface QuantityContext {
  input: unknown
  result: unknown
}

export interface Quantity {
  /** In words, lower case, as it reads inside a sentence: 'molar entropy'. */
  label: string
  symbol?: string
  /** Unit of the stored value; absent for pure numbers (fractions, partition functions). */
  unit?: string | ((context: QuantityContext) => string | undefined)
  /** 'integer' prints without rounding; 'text' is not a number; 'flag' is yes or no. */
  form?: 'real' | 'integer' | 'text' | 'flag' | 'exact'
}

/** A group of named fields (an object in the result). */
export interface QuantityGroup {
  fields: Record<string, QuantityNode>
  /** Names the group as an item in words ('translation'), when its fields are read of it. */
  name?: string
}

/** A list in the result: every item is `each`; `item` names one item in words. */
export interface QuantityList {
  each: QuantityNode
  item: (index: number, element: unknown, context: QuantityContext, parent: unknown) => string
}

export type QuantityNode = Quantity | QuantityGroup | QuantityList

export const isGroup = (node: QuantityNode): node is QuantityGroup => 'fields' in node
export const isList = (node: QuantityNode): node is QuantityList => 'each' in node

type Loose = Record<string, unknown> | undefined
const field = (value: unknown, key: string): unknown => (value !== null && typeof value === 'object' ? (value as Record<string, unknown>)[key] : undefined)
const labelled = (base: string, label: unknown) => (typeof label === 'string' && label.trim() && label.trim() !== base ? `${base} (${label.trim()})` : base)

/** A spin projection as physicists write it: +1/2, −3/2, 0, +1. */
export function projectionText(m: unknown): string {
  if (typeof m !== 'number') return String(m)
  const sign = m > 0 ? '+' : m < 0 ? '−' : ''
  const magnitude = Math.abs(m)
  return Number.isInteger(magnitude) ? `${sign}${magnitude}` : `${sign}${Math.round(magnitude * 2)}/2`
}

const J = 'J'
const J_PER_MOL = 'J/mol'
const J_PER_MOL_K = 'J/(mol·K)'
const K = 'K'
const WAVENUMBER = 'cm⁻¹'

const temperature: Quantity = { label: 'temperature', symbol: 'T', unit: K }
const molar = {
  molarInternalEnergy: { label: 'molar internal energy', symbol: 'U', unit: J_PER_MOL },
  molarEntropy: { label: 'molar entropy', symbol: 'S', unit: J_PER_MOL_K },
  molarHeatCapacity: { label: 'molar heat capacity at constant volume', symbol: 'C_V', unit: J_PER_MOL_K },
} satisfies Record<string, Quantity>
const fraction: Quantity = { label: 'fraction', symbol: 'p' }
const log10Fraction: Quantity = { label: 'base-10 logarithm of the fraction', symbol: 'log₁₀ p' }

function levelName(index: number, label: unknown) {
  return labelled(`level ${index + 1}`, label)
}
const tableLevelName = (index: number, _element: unknown, context: QuantityContext) => {
  const labels = field(field(context.result, 'levelTable'), 'labels')
  return levelName(index, Array.isArray(labels) ? labels[index] : undefined)
}
const tableEnergyUnit = (context: QuantityContext) => {
  const unit = field(field(context.result, 'levelTable'), 'energyUnit')
  return typeof unit === 'string' ? unit.replace(/cm\^?-1/g, WAVENUMBER) : undefined
}

const levels: QuantityGroup = {
  fields: {
    temperature,
    partitionFunction: { label: 'partition function, energies as given', symbol: 'q' },
    log10PartitionFunction: { label: 'base-10 logarithm of the partition function, energies as given', symbol: 'log₁₀ q' },
    partitionFunctionFromLowest: { label: 'partition function from the lowest level', symbol: 'q₀' },
    levels: {
      item: (index, element) => levelName(index, field(element, 'label')),
      each: {
        fields: {
          label: { label: 'label', form: 'text' },
          energy: { label: 'energy as typed', symbol: 'E', form: 'text' },
          energyJ: { label: 'energy per particle', symbol: 'E', unit: J },
          degeneracy: { label: 'degeneracy', symbol: 'g', form: 'integer' },
          fraction,
          log10Fraction,
          count: { label: 'expected number of particles', symbol: 'N' },
          belowOneParticle: { label: 'fewer than one particle on average', form: 'flag' },
        },
      },
    },
    levelTable: {
      fields: {
        energyUnit: { label: 'energy unit of the table', form: 'text' },
        energies: { item: tableLevelName, each: { label: 'energy', symbol: 'E', unit: tableEnergyUnit } },
        degeneracies: { item: tableLevelName, each: { label: 'degeneracy', symbol: 'g', form: 'integer' } },
        labels: { item: (index) => `level ${index + 1}`, each: { label: 'label', form: 'text' } },
        fractions: { item: tableLevelName, each: { label: 'fraction', symbol: 'p' } },
        log10Fractions: { item: tableLevelName, each: log10Fraction },
        counts: { item: tableLevelName, each: { label: 'expected number of particles', symbol: 'N' } },
        belowOneParticle: { item: tableLevelName, each: { label: 'fewer than one particle on average', form: 'flag' } },
      },
    },
    mostPopulated: {
      fields: {
        index: { label: 'position of the most populated level in the list (from 0)', form: 'integer' },
        label: { label: 'label of the most populated level', form: 'text' },
        fraction: { label: 'fraction in the most populated level', symbol: 'p_max' },
      },
    },
    meanEnergyJ: { label: 'mean energy per particle', symbol: '⟨E⟩', unit: J },
    ...molar,
    particleCount: { label: 'number of particles', symbol: 'N' },
  },
}

const vibrationLevel = (_index: number, element: unknown) => `v = ${String(field(element, 'v'))}`
const vibration: QuantityGroup = {
  fields: {
    temperature,
    energyZero: { label: 'energy zero', form: 'text' },
    modes: {
      item: (index, element) => labelled(`mode ${index + 1}`, field(element, 'label')),
      each: {
        fields: {
          label: { label: 'label', form: 'text' },
          wavenumber: { label: 'harmonic wavenumber', symbol: 'ω', unit: WAVENUMBER },
          vibrationalTemperature: { label: 'vibrational temperature', symbol: 'Θ_vib', unit: K },
          degeneracy: { label: 'degeneracy', symbol: 'g', form: 'integer' },
          model: { label: 'oscillator model', form: 'text' },
          partitionFunction: { label: 'partition function of one oscillator', symbol: 'q' },
          log10PartitionFunction: { label: 'base-10 logarithm of the partition function of one oscillator', symbol: 'log₁₀ q' },
          zeroPointEnergyJ: { label: 'zero-point energy per oscillator', symbol: 'E₀', unit: J },
          highestBoundLevel: { label: 'highest bound level', symbol: 'v_max', form: 'integer' },
          highestQuantumNumberSummed: { label: 'highest quantum number summed', symbol: 'v_sum', form: 'integer' },
          summationStop: { label: 'why the sum stops there', form: 'text' },
          populations: {
            item: vibrationLevel,
            each: {
              fields: {
                v: { label: 'vibrational quantum number', symbol: 'v', form: 'integer' },
                degeneracy: { label: 'states at this level', symbol: 'g_v = (v+d−1 choose v)', form: 'integer' },
                energyJ: { label: 'energy above the energy zero', symbol: 'E', unit: J },
                fraction,
                log10Fraction,
              },
            },
          },
          ...molar,
        },
      },
    },
    partitionFunction: { label: 'partition function of all modes', symbol: 'q' },
    log10PartitionFunction: { label: 'base-10 logarithm of the partition function of all modes', symbol: 'log₁₀ q' },
    summationTolerance: { label: 'population left out of each sum, at most (fraction)', symbol: 'ε' },
    ...molar,
  },
}

const rotation: QuantityGroup = {
  fields: {
    temperature,
    rotationalTemperature: { label: 'rotational temperature', symbol: 'Θ_rot', unit: K },
    rotationalConstantWavenumber: { label: 'rotational constant', symbol: 'B', unit: WAVENUMBER },
    partitionFunction: { label: 'rotational partition function (exact sum)', symbol: 'q' },
    highTemperaturePartitionFunction: { label: 'high-temperature partition function', symbol: 'q ≈ T/σΘ_rot' },
    correctedHighTemperaturePartitionFunction: { label: 'high-temperature partition function with the first correction', symbol: 'q ≈ T/σΘ_rot (1 + Θ_rot/3T)' },
    populations: {
      item: (_index, element) => `J = ${String(field(element, 'J'))}`,
      each: {
        fields: {
          J: { label: 'rotational quantum number', symbol: 'J', form: 'integer' },
          degeneracy: { label: 'degeneracy with nuclear-spin weight', symbol: 'g' },
          energyJ: { label: 'energy per particle', symbol: 'E', unit: J },
          wavenumber: { label: 'energy as a wavenumber', symbol: 'E/hc', unit: WAVENUMBER },
          fraction,
          log10Fraction,
        },
      },
    },
    mostPopulatedJ: { label: 'most populated J', symbol: 'J_max', form: 'integer' },
    mostPopulatedJContinuous: { label: 'most populated J from the rigid-rotor formula', symbol: '√(T/2Θ_rot) − ½' },
    highestJ: { label: 'highest J summed', form: 'integer' },
    symmetryTreatment: { label: 'how symmetry enters the sum', form: 'text' },
    symmetryNumberDivided: { label: 'symmetry number the sum is divided by', symbol: 'σ', form: 'integer' },
    ...molar,
  },
}

const spin: QuantityGroup = {
  fields: {
    temperature,
    nucleus: { label: 'nucleus', form: 'text' },
    gyromagneticRatio: { label: 'gyromagnetic ratio', symbol: 'γ', unit: 'rad s⁻¹ T⁻¹' },
    spinQuantumNumber: { label: 'nuclear spin quantum number', symbol: 'I' },
    field: { label: 'magnetic field', symbol: 'B₀', unit: 'T' },
    larmorFrequency: { label: 'Larmor frequency', symbol: 'ν₀', unit: 'Hz' },
    zeemanSplittingJ: { label: 'Zeeman splitting between neighbouring levels', symbol: 'ħγB₀', unit: J },
    levels: {
      item: (_index, element) => `m = ${projectionText(field(element, 'm'))}`,
      each: {
        fields: {
          m: { label: 'magnetic quantum number', symbol: 'm' },
          energyJ: { label: 'Zeeman energy per nucleus', symbol: 'E', unit: J },
          fraction,
          log10Fraction,
        },
      },
    },
    polarization: { label: 'polarization', symbol: 'P' },
    highTemperaturePolarization: { label: 'polarization in the high-temperature approximation', symbol: 'P ≈ γħB₀(I+1)/3kT' },
    populationRatio: { label: 'population ratio of neighbouring levels (lower/upper)', symbol: 'p₋/p₊' },
  },
}

const occupationName = (index: number, _element: unknown, context: QuantityContext) =>
  field(context.result, 'model') === 'oscillators' ? `oscillators holding ${index} ${index === 1 ? 'quantum' : 'quanta'}` : `particles on level ${index + 1}`
const distribution = (): QuantityGroup => ({
  fields: {
    occupations: { item: occupationName, each: { label: 'number', symbol: 'n_i' } },
    microstates: { label: 'number of microstates (exact)', symbol: 'W', form: 'exact' },
    log10Microstates: { label: 'base-10 logarithm of the number of microstates', symbol: 'log₁₀ W' },
    probability: { label: 'probability', symbol: 'P' },
  },
})
const occupationsText = (element: unknown) => {
  const occupations = field(element, 'occupations')
  return Array.isArray(occupations) ? occupations.join(' ') : ''
}
const microstates: QuantityGroup = {
  fields: {
    model: { label: 'model', form: 'text' },
    particles: { label: 'number of particles or oscillators', symbol: 'N', form: 'integer' },
    totalMicrostates: { label: 'total number of microstates (exact)', symbol: 'Ω', form: 'exact' },
    log10TotalMicrostates: { label: 'base-10 logarithm of the total number of microstates', symbol: 'log₁₀ Ω' },
    enumerationComplete: { label: 'every distribution listed', form: 'flag' },
    distributionCount: { label: 'number of distributions', form: 'integer' },
    distributions: { item: (index, element) => `distribution ${index + 1} (${occupationsText(element)})`, each: distribution() },
    mostProbable: distribution(),
    boltzmannPrediction: {
      fields: {
        occupations: { item: occupationName, each: { label: 'Boltzmann (most probable) number', symbol: 'n_i*' } },
        lnMicrostates: { label: 'natural logarithm of the microstates of the Boltzmann distribution', symbol: 'ln W*' },
        temperature: {
          label: 'temperature of the Boltzmann distribution',
          symbol: 'T',
          unit: (context) => (field(context.result, 'model') === 'oscillators' ? 'kT/ħω' : K),
        },
        shareOfLnTotal: { label: 'share of ln Ω carried by the Boltzmann distribution', symbol: 'ln W*/ln Ω' },
      },
    },
    message: { label: 'note', form: 'text' },
  },
}

const boltzmannPlot: QuantityGroup = {
  fields: {
    temperature: { label: 'excitation temperature', symbol: 'T', unit: K },
    temperatureUncertainty: { label: 'standard uncertainty of the temperature', symbol: 'u(T)', unit: K },
    slope: { label: 'slope of the fit line', symbol: 'm', unit: 'K⁻¹' },
    slopeUncertainty: { label: 'standard uncertainty of the slope', symbol: 'u(m)', unit: 'K⁻¹' },
    intercept: { label: 'intercept of the fit line', symbol: 'b' },
    interceptUncertainty: { label: 'standard uncertainty of the intercept', symbol: 'u(b)' },
    rSquared: { label: 'coefficient of determination', symbol: 'R²' },
    chiSquared: { label: 'weighted sum of squared residuals', symbol: 'χ²' },
    weighted: { label: 'weighted by the intensity uncertainties', form: 'flag' },
    points: {
      item: (index, element) => labelled(`line ${index + 1}`, field(element, 'label')),
      each: {
        fields: {
          label: { label: 'label', form: 'text' },
          upperEnergyJ: { label: 'upper-level energy', symbol: 'E_u', unit: J },
          energyOverK: { label: 'upper-level energy over k', symbol: 'E_u/k', unit: K },
          y: { label: 'measured ln(I·λ/(g·A))', symbol: 'y' },
          fitted: { label: 'fitted ln(I·λ/(g·A))', symbol: 'ŷ' },
          residual: { label: 'residual', symbol: 'y − ŷ' },
        },
      },
    },
  },
}

const contribution: QuantityGroup = {
  fields: {
    partitionFunction: { label: 'partition function', symbol: 'q' },
    entropy: { label: 'standard molar entropy', symbol: 'S°', unit: J_PER_MOL_K },
    heatCapacityP: { label: 'molar heat capacity at constant pressure', symbol: 'C_p°', unit: J_PER_MOL_K },
    enthalpyMinusH0: { label: 'enthalpy above 0 K', symbol: 'H° − H°(0)', unit: J_PER_MOL },
  },
}
export const MOTIONS = { translational: 'translation', rotational: 'rotation', vibrational: 'vibration', electronic: 'electronic levels' } as const
const thermochemistry: QuantityGroup = {
  fields: {
    temperature,
    pressure: { label: 'standard pressure', symbol: 'p°', unit: 'Pa' },
    contributions: {
      fields: Object.fromEntries(Object.entries(MOTIONS).map(([key, words]) => [key, { ...contribution, name: words }])),
    },
    totals: {
      fields: {
        entropy: contribution.fields.entropy!,
        heatCapacityP: contribution.fields.heatCapacityP!,
        heatCapacityV: { label: 'molar heat capacity at constant volume', symbol: 'C_V°', unit: J_PER_MOL_K },
        enthalpyMinusH0: contribution.fields.enthalpyMinusH0!,
        gibbsMinusH0: { label: 'Gibbs energy above 0 K', symbol: 'G° − H°(0)', unit: J_PER_MOL },
        zeroPointEnergy: { label: 'harmonic zero-point energy', symbol: 'E_ZPE', unit: J_PER_MOL },
      },
    },
    rotation: {
      fields: {
        rotorType: { label: 'rotor type', form: 'text' },
        method: { label: 'how the rotational sum was done', form: 'text' },
        highestJSummed: { label: 'highest J summed', form: 'integer' },
        tolerance: { label: 'part of the sum left out, at most (fraction)', symbol: 'ε' },
        nextTermEstimate: { label: 'estimate of the terms the classical form leaves out (fraction)' },
        nuclearSpinTreatment: { label: 'nuclear-spin statistics', form: 'text' },
        symmetryNumber: { label: 'rotational symmetry number used', symbol: 'σ', form: 'integer' },
      },
    },
    modeCount: {
      fields: {
        given: { label: 'vibrational modes given (with degeneracy)', form: 'integer' },
        expected: { label: 'vibrational modes expected (3N − 5 or 3N − 6)', form: 'integer' },
        atoms: { label: 'atoms', symbol: 'N', form: 'integer' },
      },
    },
  },
}

/** The quantity catalogue of every kind's result (sweep and solveTemperature name their outputs through the swept kind). */
export const RESULT_QUANTITIES: Record<string, QuantityGroup> = {
  levels, vibration, rotation, spin, microstates, boltzmannPlot, thermochemistry,
  sweep: {
    fields: {
      kind: { label: 'swept calculation', form: 'text' },
      parameter: { label: 'swept parameter', form: 'text' },
      temperatures: { item: (index) => `grid point ${index + 1}`, each: temperature },
      // `series[i].values[j]` is named through the swept kind (see describeResultQuantity).
      series: { item: (index, element) => `series ${index + 1} (${String(field(element, 'output'))})`, each: { fields: { output: { label: 'output path', form: 'text' } } } },
    },
  },
  solveTemperature: {
    fields: {
      kind: { label: 'calculation solved', form: 'text' },
      output: { label: 'output path', form: 'text' },
      target: { label: 'target value' },
      temperature: { label: 'temperature at which the output reaches the target', symbol: 'T', unit: K },
      value: { label: 'value of the output there' },
    },
  },
}

/** The unit of a quantity in a context. */
export function unitOf(quantity: Quantity, context: QuantityContext): string | undefined {
  return typeof quantity.unit === 'function' ? quantity.unit(context) : quantity.unit
}

export type { Loose }
