// Runs ASE's ideal-gas thermochemistry (tests/support/ase_ideal_gas.py) for the comparison suite,
// only where a python3 on this machine can import ase (Debian's python3-ase). Nothing here is
// part of the app.
import { execFileSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'

const SCRIPT = fileURLToPath(new URL('./ase_ideal_gas.py', import.meta.url))
const CANDIDATES = ['python3', '/usr/bin/python3']

export interface AseMolecule {
  geometry: 'linear' | 'nonlinear'
  /** Atomic masses in u. */
  masses: number[]
  /** Positions in Å. */
  positions: [number, number, number][]
  /** Vibrational energies in eV, degenerate ones repeated. */
  vibrationEnergies: number[]
  sigma: number
  /** Electronic spin S (degeneracy 2S + 1). */
  spin: number
  temperature: number
  /** Pa. */
  pressure: number
}

export interface AseReference {
  /** Principal moments of inertia, u Å². */
  inertias: number[]
  /** eV/K and eV per molecule. */
  entropy: number
  enthalpy: number
  translationalElectronicEntropy: number
  vibrationalEntropy: number
  vibrationalEnergy: number
  zeroPointEnergy: number
  rotationalEntropy: number
}

/** The python3 that imports ase, or null with the reason it is missing. */
export function findAsePython(): { python: string | null; reason: string } {
  for (const python of CANDIDATES) {
    try {
      const version = execFileSync(python, ['-c', 'import ase; print(ase.__version__)'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim()
      return { python, reason: `${python} imports ase ${version}` }
    } catch {
      // try the next one
    }
  }
  return { python: null, reason: 'no python3 here imports ase (install Debian\'s python3-ase to run the ASE comparison)' }
}

/** ASE's values for each molecule, in one python run. */
export function aseReferences(python: string, molecules: AseMolecule[]): AseReference[] {
  const output = execFileSync(python, [SCRIPT], { input: JSON.stringify(molecules), encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 })
  return JSON.parse(output) as AseReference[]
}
