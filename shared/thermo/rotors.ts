/**
 * Rigid-rotor levels for thermochemistry: linear rotors, symmetric and spherical tops in closed
 * form, and asymmetric tops by diagonalising the rigid-rotor Hamiltonian for each J in the
 * Wang-symmetrised symmetric-top basis (King, Hainer and Cross, J. Chem. Phys. 11, 27 (1943);
 * Gordy and Cook, Microwave Molecular Spectra, 3rd ed., 1984, ch. 7; Zare, Angular Momentum,
 * 1988, §6.4). Each level carries its symmetry class, the parities of Ka and Kc (0 ee, 1 eo,
 * 2 oe, 3 oo; for a linear rotor 0 even J, 1 odd J), so nuclear-spin weights can be applied
 * per class.
 *
 * Sums stop by one rule: at the first J above which every remaining level provably holds less
 * than ROTOR_TOLERANCE of the sum. The J-manifold's states number at most (2J+1)² and lie no
 * lower than C J(J+1) (C the smallest constant), so t_J = (2J+1)² e^{-C J(J+1)/kT} bounds the
 * manifold; the ratios t_{J+1}/t_J fall with J, so once below 1 the rest is at most
 * t_{J+1}/(1 - ratio) (a geometric bound). The share is taken of the smallest class's sum, so
 * the sum of each symmetry class on its own is converged as well.
 */

/** The levels above the last J summed hold at most this share of the partition function. */
export const ROTOR_TOLERANCE = 1e-12

export interface RotorLevels {
  /** Energies in J, from the J = 0 level. */
  energies: number[]
  /** Rotational degeneracy (2J+1 for each M; symmetric tops include the ±K pair). */
  degeneracies: number[]
  /** Symmetry class of each level (see the file comment). */
  classes: number[]
  highestJ: number
  /** False when the level limit stopped the sum before the tolerance was reached. */
  converged: boolean
}

/** Eigenvalues of a real symmetric tridiagonal matrix (implicit QL with Wilkinson shifts). */
export function tridiagonalEigenvalues(diagonal: Float64Array, offDiagonal: Float64Array): Float64Array {
  const n = diagonal.length
  const d = Float64Array.from(diagonal)
  const e = new Float64Array(n)
  for (let index = 0; index < n - 1; index++) e[index] = offDiagonal[index]!
  for (let l = 0; l < n; l++) {
    let iterations = 0
    for (;;) {
      let m = l
      for (; m < n - 1; m++) {
        const scale = Math.abs(d[m]!) + Math.abs(d[m + 1]!)
        if (Math.abs(e[m]!) <= Number.EPSILON * scale) break
      }
      if (m === l) break
      if (++iterations > 60) throw new RangeError('the rotor eigenvalues did not converge')
      let g = (d[l + 1]! - d[l]!) / (2 * e[l]!)
      let r = Math.sqrt(g * g + 1)
      g = d[m]! - d[l]! + e[l]! / (g + (g >= 0 ? r : -r))
      let s = 1
      let c = 1
      let p = 0
      let i = m - 1
      for (; i >= l; i--) {
        let f = s * e[i]!
        const b = c * e[i]!
        r = Math.sqrt(f * f + g * g)
        e[i + 1] = r
        if (r === 0) {
          d[i + 1]! -= p
          e[m] = 0
          break
        }
        s = f / r
        c = g / r
        g = d[i + 1]! - p
        r = (d[i]! - g) * s + 2 * c * b
        p = s * r
        d[i + 1] = g + p
        g = c * r - b
        f = 0
      }
      if (r === 0 && i >= l) continue
      d[l]! -= p
      e[l] = g
      e[m] = 0
    }
  }
  return d
}

/**
 * The 2J+1 rigid asymmetric-top levels of one J (A ≥ B ≥ C in J), with their Ka and Kc parities.
 * Basis: the symmetric-top functions |J,K> about the a axis (representation I^r), Wang
 * combinations (|K> ± |-K>)/√2, which split H into four tridiagonal blocks: K even or odd, sign
 * + or -. H = A Ja² + B Jb² + C Jc²: diagonal (B+C)/2 [J(J+1) - K²] + A K², and
 * <K+2|H|K> = (B-C)/4 √{[J(J+1) - K(K+1)][J(J+1) - (K+1)(K+2)]}. The parity of Ka is that of K;
 * a Wang function of sign s has C2(c) eigenvalue (-1)^Kc = s (-1)^(J+K).
 */
export function asymmetricTopLevels(J: number, A: number, B: number, C: number): { energy: number; kaOdd: boolean; kcOdd: boolean }[] {
  // Diagonalised in units of C (the eigen-solver's tolerances are relative; this keeps numbers near 1).
  const unit = C
  return reducedAsymmetricTopLevels(J, A / unit, B / unit, 1).map((level) => ({ ...level, energy: level.energy * unit }))
}

function reducedAsymmetricTopLevels(J: number, A: number, B: number, C: number): { energy: number; kaOdd: boolean; kcOdd: boolean }[] {
  const n = J * (J + 1)
  const diagonal = (K: number) => ((B + C) / 2) * (n - K * K) + A * K * K
  const coupling = (K: number) => ((B - C) / 4) * Math.sqrt((n - K * (K + 1)) * (n - (K + 1) * (K + 2)))
  const levels: { energy: number; kaOdd: boolean; kcOdd: boolean }[] = []
  for (const kOdd of [false, true]) {
    for (const sign of [1, -1]) {
      const ks: number[] = []
      for (let K = kOdd ? 1 : sign === 1 ? 0 : 2; K <= J; K += 2) ks.push(K)
      if (ks.length === 0) continue
      const main = new Float64Array(ks.length)
      const off = new Float64Array(Math.max(0, ks.length - 1))
      ks.forEach((K, index) => {
        main[index] = diagonal(K)
        // |J,1> and |J,-1> are coupled directly: <1|H|-1> = (B-C)/4 J(J+1).
        if (K === 1) main[index]! += sign * ((B - C) / 4) * n
        if (index < ks.length - 1) off[index] = coupling(K) * (K === 0 ? Math.SQRT2 : 1)
      })
      const values = tridiagonalEigenvalues(main, off)
      const kcOdd = sign * ((J + (kOdd ? 1 : 0)) % 2 === 0 ? 1 : -1) === -1
      for (const energy of values) levels.push({ energy, kaOdd: kOdd, kcOdd })
    }
  }
  return levels
}

/**
 * The levels of each J for the last set of constants: they do not depend on the temperature, so
 * a sweep over temperatures diagonalises once. Deterministic, so the functions stay pure in effect.
 */
const levelCache = { key: '', byJ: [] as { energy: number; kaOdd: boolean; kcOdd: boolean }[][] }

function cachedAsymmetricTopLevels(J: number, A: number, B: number, C: number) {
  const key = `${A} ${B} ${C}`
  if (levelCache.key !== key) {
    levelCache.key = key
    levelCache.byJ = []
  }
  return (levelCache.byJ[J] ??= asymmetricTopLevels(J, A, B, C))
}

/** Rotor kinds the thermochemistry block tells apart. */
export type RotorType = 'linear' | 'spherical top' | 'prolate symmetric top' | 'oblate symmetric top' | 'asymmetric top'

/** Which kind of top the three constants (J) describe; equal within one part in 10^9. */
export function rotorType(constants: number[]): RotorType {
  if (constants.length === 1) return 'linear'
  const [A, B, C] = [...constants].sort((x, y) => y - x) as [number, number, number]
  const same = (x: number, y: number) => Math.abs(x - y) <= 1e-9 * Math.max(x, y)
  if (same(A, B) && same(B, C)) return 'spherical top'
  if (same(B, C)) return 'prolate symmetric top'
  if (same(A, B)) return 'oblate symmetric top'
  return 'asymmetric top'
}

/**
 * All rigid-rotor levels up to convergence (ROTOR_TOLERANCE) or `limitJ`. `diagonalise` forces
 * the asymmetric-top path (used when nuclear-spin weights per Ka/Kc class are wanted).
 * `weightBound` is the largest relative weight a level may carry (for the stopping bound).
 */
export function rotorLevels(constants: number[], kT: number, limitJ: number, diagonalise = false, weightBound = 1): RotorLevels {
  const type = rotorType(constants)
  const [A, B, C] = constants.length === 1 ? [constants[0]!, constants[0]!, constants[0]!] : ([...constants].sort((x, y) => y - x) as [number, number, number])
  const energies: number[] = []
  const degeneracies: number[] = []
  const classes: number[] = []
  const classCount = type === 'linear' ? 2 : type === 'asymmetric top' || diagonalise ? 4 : 1
  const classSums = [0, 0, 0, 0]
  const smallest = C
  const manifoldBound = (J: number) => (type === 'linear' ? 2 * J + 1 : (2 * J + 1) ** 2) * Math.exp((-smallest * J * (J + 1)) / kT)
  for (let J = 0; J <= limitJ; J++) {
    const before = energies.length
    if (type === 'linear') {
      energies.push(B * J * (J + 1))
      degeneracies.push(2 * J + 1)
      classes.push(J % 2)
    } else if (type === 'asymmetric top' || diagonalise) {
      for (const level of cachedAsymmetricTopLevels(J, A, B, C)) {
        energies.push(level.energy)
        degeneracies.push(2 * J + 1)
        classes.push((level.kaOdd ? 2 : 0) + (level.kcOdd ? 1 : 0))
      }
    } else if (type === 'spherical top') {
      energies.push(B * J * (J + 1))
      degeneracies.push((2 * J + 1) ** 2)
      classes.push(0)
    } else {
      // Prolate: E = B J(J+1) + (A - B) K²; oblate: E = B J(J+1) + (C - B) K² (Gordy and Cook, eq. 7.1-7.2).
      const unique = type === 'prolate symmetric top' ? A : C
      const middle = type === 'prolate symmetric top' ? B : A
      for (let K = 0; K <= J; K++) {
        energies.push(middle * J * (J + 1) + (unique - middle) * K * K)
        degeneracies.push(K === 0 ? 2 * J + 1 : 2 * (2 * J + 1))
        classes.push(0)
      }
    }
    for (let index = before; index < energies.length; index++) classSums[classes[index]!]! += degeneracies[index]! * Math.exp(-energies[index]! / kT)
    // Relative to the smallest class sum, so each nuclear-spin modification (summed on its own in
    // the normal treatment) is converged too.
    const running = Math.min(...classSums.slice(0, classCount))
    const next = manifoldBound(J + 1)
    const ratio = manifoldBound(J + 2) / next
    if (J >= 1 && ratio < 1 && (weightBound * next) / (1 - ratio) < ROTOR_TOLERANCE * running) {
      return { energies, degeneracies, classes, highestJ: J, converged: true }
    }
  }
  return { energies, degeneracies, classes, highestJ: limitJ, converged: false }
}

/**
 * The classical rigid-rotor partition function of a nonlinear molecule with its first quantum
 * correction, q = (√π/σ) (T³/(Θ_A Θ_B Θ_C))^{1/2} (1 + c/T) with
 * c = [2(Θ_A + Θ_B + Θ_C) - (Θ_AΘ_B/Θ_C + Θ_BΘ_C/Θ_A + Θ_CΘ_A/Θ_B)]/12 (Stripp and Kirkwood,
 * J. Chem. Phys. 19, 1131 (1951); for a symmetric top Viney, Proc. Camb. Phil. Soc. 29, 142
 * (1933)). Returns ln q and the molar functions over R: U/RT, S/R, C/R.
 */
export function correctedClassicalTop(thetas: number[], sigma: number, temperature: number) {
  const [a, b, c] = thetas as [number, number, number]
  const correction = (2 * (a + b + c) - (a * b / c + b * c / a + c * a / b)) / 12
  const lnQ = 0.5 * Math.log(Math.PI) - Math.log(sigma) + 0.5 * (3 * Math.log(temperature) - Math.log(a) - Math.log(b) - Math.log(c)) + Math.log1p(correction / temperature)
  const energyOverRT = 1.5 - correction / (temperature + correction)
  const heatCapacityOverR = 1.5 - (correction * correction) / ((temperature + correction) * (temperature + correction))
  // The left-out terms are of second order in Θ/T, with coefficients that grow with the asymmetry:
  // (Θ_max/T)² Θ_max/Θ_min bounds the gap to the exact sum over random tops (tests/unit/thermo).
  const largest = Math.max(a, b, c)
  const nextTermEstimate = (largest / temperature) ** 2 * (largest / Math.min(a, b, c))
  return { lnQ, energyOverRT, entropyOverR: lnQ + energyOverRT, heatCapacityOverR, correction, nextTermEstimate }
}
