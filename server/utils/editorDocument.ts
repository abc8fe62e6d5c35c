import { editorDocumentIssues } from '#shared/editor/validate'

/**
 * Refuses an entry document the editor could not have made: unknown node or mark types, bad
 * attributes, or a calculation block whose input the engine refuses. 400 naming the block
 * (title and blockId) and the field; data.issues lists them all.
 */
export function assertEditorDocumentValid(document: unknown): void {
  const issues = editorDocumentIssues(document)
  if (issues.length === 0)
    return
  const first = issues[0]!
  const where = first.blockId !== undefined || first.field !== undefined ? 'content' : `content${first.path ? `.${first.path}` : ''}`
  const message = `${where}: ${first.message}${issues.length > 1 ? ` (and ${issues.length - 1} more)` : ''}`
  throw createError({ statusCode: 400, message, data: { issues: issues.map(issue => ({ ...issue, path: issue.path ? `content.${issue.path}` : 'content' })) } })
}
