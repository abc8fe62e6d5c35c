/**
 * Result columns: the long lists of numbers in a result (one per level of a level table), held
 * as typed arrays so that a 10^6-level evaluation does not spend its time building plain arrays.
 * They index, iterate and measure like arrays, and JSON.stringify and canonical JSON (both call
 * toJSON) write them as plain JSON arrays: the JSON of a result, and so every signed record and
 * every HTTP answer, is the same as with plain arrays. Copy one with Array.from for array methods
 * such as map that should return something other than numbers; structuredClone keeps the numbers
 * but not toJSON, so clone the JSON form instead.
 */

/** A column of numbers; a value outside the range of a double is written as null, as everywhere in results. */
export class NumberColumn extends Float64Array {
  toJSON(): (number | null)[] {
    const plain = new Array<number | null>(this.length)
    for (let index = 0; index < this.length; index++) {
      const value = this[index]!
      plain[index] = value - value === 0 ? value : null
    }
    return plain
  }

  /** Whether every value is finite (NaN and ±Infinity are written as null). */
  allFinite(): boolean {
    for (let index = 0; index < this.length; index++) {
      const value = this[index]!
      if (value - value !== 0) return false
    }
    return true
  }
}

/** A column of yes/no flags (1 or 0 in memory), written as JSON true/false. */
export class FlagColumn extends Uint8Array {
  toJSON(): boolean[] {
    const plain = new Array<boolean>(this.length)
    for (let index = 0; index < this.length; index++) plain[index] = this[index] !== 0
    return plain
  }
}

/** Whether a value is a result column (a typed array that serialises as a JSON array). */
export function isResultColumn(value: unknown): value is NumberColumn | FlagColumn {
  return value instanceof NumberColumn || value instanceof FlagColumn
}

/**
 * Lists a kind has already checked to hold finite numbers only (validated inputs it echoes, or
 * columns whose numbers are finite by construction): the engine's final scan for NaN and
 * ±Infinity skips them, which at 10^6 levels saves more than the rest of the evaluation.
 */
const knownFinite = new WeakSet<object>()

/** Marks a list as holding finite numbers only and returns it. */
export function markFinite<T extends object>(list: T): T {
  knownFinite.add(list)
  return list
}

/** Whether a list was marked as holding finite numbers only. */
export function isKnownFinite(value: object): boolean {
  return knownFinite.has(value)
}
