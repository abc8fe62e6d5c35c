import { v1EvaluateSchema } from '#shared/schemas/v1'
import { presentResult } from '#shared/present'
import { EngineInputError, evaluate } from '#shared/thermo'

export default defineEventHandler(async (event) => {
  await requireApiToken(event, 'records:read')
  const body = await validBody(event, v1EvaluateSchema)
  try {
    const evaluation = evaluate(body)
    return { ...evaluation, presentation: presentResult(body.kind, body.input, evaluation.result, {}, evaluation.warnings) }
  }
  catch (error) {
    if (error instanceof EngineInputError)
      validationError(error.issues.map(issue => ({ path: issue.path === 'kind' ? 'kind' : `input${issue.path ? `.${issue.path}` : ''}`, message: issue.message })), 'body')
    throw error
  }
})
