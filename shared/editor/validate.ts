/**
 * The whole-document check of an entry: allowed node and mark types with checked attributes,
 * and every calculation block's attributes and input through the engine (the same zod
 * schemas the browser uses). Pure: used by the server before saving and by tests.
 */
import { EngineInputError, evaluate, registry } from '../thermo'
import { ALLOWED_MARKS, ALLOWED_NODES, CALCULATION_BLOCK, MAX_CALCULATION_BLOCKS } from './nodes'

export interface DocumentIssue {
  /** Where in the document: `content[3].content[0]`, or for a block field `content[2].attrs.input.temperature`. */
  path: string
  /** What is wrong, in words; names the block by title and id when it concerns one. */
  message: string
  /** The block concerned, when there is one. */
  blockId?: string
  blockTitle?: string
  /** The block's field concerned (`input.levels[1].energy`, `title`, ...). */
  field?: string
  /**
   * True for a block whose input does not compute yet (a temperature without its unit, a new
   * empty block): a draft is saved as it is, with the block marked; only signing refuses it.
   * Every other issue is the document's shape and is refused on saving.
   */
  incomplete?: boolean
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i
const MAX_DEPTH = 40
const MAX_NODES = 50_000
const MAX_TEXT = 200_000

/** `a.b` without a leading dot at the root. */
const join = (path: string, key: string) => (path ? `${path}.${key}` : key)

const isRecord = (value: unknown): value is Record<string, unknown> =>
  value !== null && typeof value === 'object' && !Array.isArray(value)

/** How a block is named in messages: its title and id. */
export function describeBlock(title: unknown, blockId: unknown): string {
  const name = typeof title === 'string' && title.trim() ? `'${title.trim().slice(0, 80)}'` : 'without a title'
  return `calculation block ${name}${typeof blockId === 'string' ? ` (blockId ${blockId.slice(0, 40)})` : ''}`
}

/**
 * Lists every problem of an editor document, at most `limit`. Issues marked `incomplete` are
 * block inputs that do not compute yet: the draft is stored with them (nothing typed is lost)
 * and signing refuses them; any other issue means the document may not be stored.
 */
export function editorDocumentIssues(document: unknown, limit = 20): DocumentIssue[] {
  const issues: DocumentIssue[] = []
  const seenBlocks = new Set<string>()
  let nodes = 0
  let blocks = 0
  const add = (issue: DocumentIssue) => {
    if (issues.length < limit) issues.push(issue)
  }

  const checkAttrs = (attrs: unknown, allowed: Record<string, (value: unknown) => string | null>, path: string, what: string) => {
    if (attrs === undefined || attrs === null) return
    if (!isRecord(attrs)) return add({ path: join(path, `attrs`), message: `expected the attributes of ${what} as an object` })
    for (const [key, value] of Object.entries(attrs)) {
      const check = allowed[key]
      if (!check) {
        add({ path: join(path, `attrs.${key}`), message: `${what} has no attribute '${key}'` })
        continue
      }
      const problem = check(value)
      if (problem) add({ path: join(path, `attrs.${key}`), message: problem })
    }
  }

  const checkBlock = (node: Record<string, unknown>, path: string) => {
    blocks++
    const attrs = isRecord(node.attrs) ? node.attrs : {}
    const { blockId, kind, title, input, collapsed } = attrs
    const name = describeBlock(title, blockId)
    const blockIssue = (field: string, message: string, incomplete = false) => add({
      path: join(path, `attrs.${field}`),
      message: `${name}: ${field}: ${message}`,
      ...(typeof blockId === 'string' ? { blockId } : {}),
      ...(typeof title === 'string' ? { blockTitle: title } : {}),
      field,
      ...(incomplete ? { incomplete: true } : {}),
    })
    if (blocks > MAX_CALCULATION_BLOCKS) return blockIssue('kind', `an entry holds at most ${MAX_CALCULATION_BLOCKS} calculation blocks`)
    if (node.content !== undefined || node.marks !== undefined) blockIssue('content', 'a calculation block holds no text or marks')
    for (const key of Object.keys(attrs)) {
      if (!['blockId', 'kind', 'title', 'input', 'collapsed'].includes(key)) blockIssue(key, `unknown attribute '${key}'`)
    }
    if (typeof blockId !== 'string' || !UUID.test(blockId)) blockIssue('blockId', 'expected a block id (UUID)')
    else if (seenBlocks.has(blockId.toLowerCase())) blockIssue('blockId', 'another block in this entry has the same id')
    else seenBlocks.add(blockId.toLowerCase())
    if (typeof title !== 'string' || title.length > 200) blockIssue('title', 'expected a title of at most 200 characters')
    if (collapsed !== undefined && typeof collapsed !== 'boolean') blockIssue('collapsed', 'expected true or false')
    if (typeof kind !== 'string' || !Object.hasOwn(registry, kind)) {
      return blockIssue('kind', `expected one of the kinds ${Object.keys(registry).join(', ')}`)
    }
    if (!isRecord(input)) return blockIssue('input', `expected the input of '${kind}' as an object with named fields`)
    try {
      evaluate({ kind, input })
    }
    catch (error) {
      if (!(error instanceof EngineInputError)) throw error
      for (const issue of error.issues) blockIssue(issue.path ? `input.${issue.path}` : 'input', issue.message, true)
    }
  }

  const walk = (node: unknown, path: string, depth: number, parent: string | null) => {
    if (issues.length >= limit) return
    if (++nodes > MAX_NODES) {
      if (nodes === MAX_NODES + 1) add({ path, message: `a document may hold at most ${MAX_NODES} nodes` })
      return
    }
    if (depth > MAX_DEPTH) return add({ path, message: `nodes may nest at most ${MAX_DEPTH} deep` })
    if (!isRecord(node)) return add({ path, message: 'expected a node (an object with a type)' })
    const type = node.type
    if (typeof type !== 'string' || !Object.hasOwn(ALLOWED_NODES, type)) {
      return add({ path: join(path, `type`), message: `the node type ${typeof type === 'string' ? `'${type.slice(0, 40)}'` : '(none)'} is not allowed in an entry` })
    }
    if (type === 'doc' && parent !== null) add({ path, message: "'doc' may only be the outermost node" })
    for (const key of Object.keys(node)) {
      if (!['type', 'attrs', 'content', 'marks', 'text'].includes(key)) add({ path: join(path, `${key}`), message: `a node has no field '${key}'` })
    }
    if (type === CALCULATION_BLOCK) return checkBlock(node, path)
    checkAttrs(node.attrs, ALLOWED_NODES[type]!, path, `a ${type} node`)
    if (type === 'text') {
      if (typeof node.text !== 'string' || node.text.length === 0 || node.text.length > MAX_TEXT) add({ path: join(path, `text`), message: `expected text of 1 to ${MAX_TEXT} characters` })
      if (node.content !== undefined) add({ path: join(path, `content`), message: 'a text node holds no nodes' })
    }
    else if (node.text !== undefined) add({ path: join(path, `text`), message: `a ${type} node holds no text of its own` })
    if (node.marks !== undefined) {
      if (type !== 'text' || !Array.isArray(node.marks)) add({ path: join(path, `marks`), message: 'only text carries marks, as a list' })
      else {
        node.marks.forEach((mark, index) => {
          const markPath = join(path, `marks[${index}]`)
          if (!isRecord(mark) || typeof mark.type !== 'string' || !Object.hasOwn(ALLOWED_MARKS, mark.type)) {
            return add({ path: join(markPath, `type`), message: `the mark type ${isRecord(mark) && typeof mark.type === 'string' ? `'${mark.type.slice(0, 40)}'` : '(none)'} is not allowed in an entry` })
          }
          for (const key of Object.keys(mark)) if (key !== 'type' && key !== 'attrs') add({ path: join(markPath, `${key}`), message: `a mark has no field '${key}'` })
          checkAttrs(mark.attrs, ALLOWED_MARKS[mark.type]!, markPath, `a ${mark.type} mark`)
        })
      }
    }
    if (node.content !== undefined) {
      if (!Array.isArray(node.content)) return add({ path: join(path, `content`), message: 'expected a list of nodes' })
      node.content.forEach((child, index) => walk(child, join(path, `content[${index}]`), depth + 1, type))
    }
  }

  if (!isRecord(document) || document.type !== 'doc') return [{ path: '', message: "expected an editor document of type 'doc'" }]
  walk(document, '', 0, null)
  return issues
}

/** The issues that stop a draft from being stored (its shape), leaving out incomplete block inputs. */
export function storageIssues(issues: readonly DocumentIssue[]): DocumentIssue[] {
  return issues.filter(issue => !issue.incomplete)
}
