import { editorDocumentIssues, storageIssues, type DocumentIssue } from '#shared/editor/validate'

/**
 * Refuses an entry document the editor could not have made: unknown node or mark types, bad
 * attributes. 400 naming the block (title and blockId) and the field; data.issues lists them
 * all. A block whose input does not compute yet is stored as it is (a draft always saves):
 * those issues are returned, for the page to mark the blocks, and signing refuses them.
 */
export function assertEditorDocumentValid(document: unknown): DocumentIssue[] {
  const all = editorDocumentIssues(document, 200)
  const issues = storageIssues(all)
  if (issues.length === 0)
    return all.filter(issue => issue.incomplete).map(issue => ({ ...issue, path: issue.path ? `content.${issue.path}` : 'content' }))
  const first = issues[0]!
  const where = first.blockId !== undefined || first.field !== undefined ? 'content' : `content${first.path ? `.${first.path}` : ''}`
  const message = `${where}: ${first.message}${issues.length > 1 ? ` (and ${issues.length - 1} more)` : ''}`
  throw createError({ statusCode: 400, message, data: { issues: issues.map(issue => ({ ...issue, path: issue.path ? `content.${issue.path}` : 'content' })) } })
}
