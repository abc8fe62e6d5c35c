import { z } from 'zod'
import { presentResult } from '#shared/present'
import { EngineInputError, evaluate } from '#shared/thermo'

const bodySchema = z.object({
  kind: z.string({ error: 'expected the name of a calculation kind' }).min(1).max(60),
  input: z.unknown(),
})

/** Engine paths are relative to the input; the request's fields are kind and input. */
function fieldPath(path: string) {
  if (path === 'kind' || path === 'input') return path
  return path ? `input.${path}` : 'input'
}

/** Evaluate one calculation with the shared engine (the same one the page and the PDF use). */
export default defineEventHandler(async (event) => {
  await requirePerson(event)
  const body = await validBody(event, bodySchema)
  try {
    const evaluation = evaluate({ kind: body.kind, input: body.input })
    // What a person reads of it, from the one presentation the page and the PDF use.
    return { ...evaluation, presentation: presentResult(body.kind, body.input, evaluation.result, {}, evaluation.warnings) }
  }
  catch (error) {
    if (error instanceof EngineInputError)
      validationError(error.issues.map(issue => ({ path: fieldPath(issue.path), message: issue.message })), 'input')
    throw error
  }
})
