/** One problem with an input: where it is (a field path) and what was expected, in words. */
export interface InputIssue {
  /** Dotted/bracket path such as `levels[2].degeneracy` or `temperature`; '' for the whole input. */
  path: string
  /** What was expected and what was found, written for a scientist. */
  message: string
}

/**
 * The one error the engine throws for invalid input. `issues` lists every problem found with
 * the field path it concerns, so a form can mark the field.
 */
export class EngineInputError extends Error {
  readonly issues: InputIssue[]

  constructor(issues: InputIssue[]) {
    const list = issues.length > 0 ? issues : [{ path: '', message: 'the input is not valid' }]
    super(list.map((issue) => (issue.path ? `${issue.path}: ${issue.message}` : issue.message)).join('; '))
    this.name = 'EngineInputError'
    this.issues = list
  }
}

/** Throws an EngineInputError for one field. */
export function inputError(path: string, message: string): never {
  throw new EngineInputError([{ path, message }])
}

/** Formats a path array (as zod gives it) as `levels[2].degeneracy`. */
export function formatPath(path: ReadonlyArray<PropertyKey>, prefix = ''): string {
  let text = prefix
  for (const key of path) {
    if (typeof key === 'number') text += `[${key}]`
    else text += text ? `.${String(key)}` : String(key)
  }
  return text
}

/** Joins a parent path and a child path (`baseInput` + `levels[0].energy`). */
export function joinPath(parent: string, child: string): string {
  if (!parent) return child
  if (!child) return parent
  return child.startsWith('[') ? parent + child : `${parent}.${child}`
}
