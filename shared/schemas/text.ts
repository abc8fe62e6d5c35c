import type { z } from 'zod'

/**
 * Characters a title must not hold: bidirectional controls (Unicode UAX #9: the embeddings
 * and overrides U+202A–U+202E, the isolates U+2066–U+2069, the marks U+200E, U+200F and
 * U+061C) and zero-width characters (U+200B–U+200D, U+2060 word joiner, U+FEFF). They make a
 * title read differently from what is stored ("Trojan Source", CVE-2021-42574), or make two
 * titles that look alike differ; a signed record's title must say what it shows.
 */
const HIDDEN_CHARACTERS: Record<number, string> = {
  0x061C: 'arabic letter mark', 0x200E: 'left-to-right mark', 0x200F: 'right-to-left mark',
  0x202A: 'left-to-right embedding', 0x202B: 'right-to-left embedding', 0x202C: 'pop directional formatting',
  0x202D: 'left-to-right override', 0x202E: 'right-to-left override',
  0x2066: 'left-to-right isolate', 0x2067: 'right-to-left isolate', 0x2068: 'first strong isolate', 0x2069: 'pop directional isolate',
  0x200B: 'zero-width space', 0x200C: 'zero-width non-joiner', 0x200D: 'zero-width joiner', 0x2060: 'word joiner', 0xFEFF: 'zero-width no-break space',
}

/** The first hidden character in the text, as "U+202E (right-to-left override)", or null. */
export function hiddenCharacterIn(text: string): string | null {
  for (const character of text) {
    const code = character.codePointAt(0)!
    const name = HIDDEN_CHARACTERS[code]
    if (name) return `U+${code.toString(16).toUpperCase().padStart(4, '0')} (${name})`
  }
  return null
}

/** Adds the hidden-character check to a string schema; zod names the field in the path. */
export function withoutHiddenCharacters<S extends z.ZodType<string>>(schema: S) {
  return schema.superRefine((value, context) => {
    const found = hiddenCharacterIn(value)
    if (found)
      context.addIssue({ code: 'custom', message: `contains ${found}, an invisible character that changes how the text reads; remove it` })
  })
}
