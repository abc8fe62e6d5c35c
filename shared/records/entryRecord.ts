import { canonicalJson } from './canonical'
import { buildRecord } from './record'
import type { Attachment, Calculation, RecordDocument } from './schema'
import { evaluate, EngineInputError } from '../thermo'

// The record of one entry version, built the same way in the browser (to check, before
// signing, that the server's record is what the page shows) and on the server (to freeze and
// to verify). DESIGN.md, "The signed record" §1: results always come from the engine here,
// never from a result a browser sent along.

/** One calculation block that cannot be computed, named so a person can find and fix it. */
export interface CalculationBlockProblem {
  blockId: string | null
  title: string
  /** Position among the document's calculation blocks, from 1. */
  position: number
  message: string
}

/** Thrown when an entry has a block that does not compute: a signed record must compute. */
export class CalculationBlockError extends Error {
  override name = 'CalculationBlockError'
  readonly problems: CalculationBlockProblem[]
  constructor(problems: CalculationBlockProblem[]) {
    super(problems.map(describeProblem).join('; '))
    this.problems = problems
  }
}

function describeProblem(problem: CalculationBlockProblem): string {
  const name = problem.title ? `"${problem.title}"` : `number ${problem.position}`
  return `calculation block ${name}${problem.blockId ? ` (${problem.blockId})` : ''}: ${problem.message}`
}

interface DocumentNode {
  type?: unknown
  attrs?: Record<string, unknown>
  content?: unknown
}

function isNode(value: unknown): value is DocumentNode {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

/** The calculationBlock nodes of an editor document, depth first, in document order. */
export function calculationBlocksOf(content: unknown): { blockId: unknown, kind: unknown, title: unknown, input: unknown }[] {
  const found: { blockId: unknown, kind: unknown, title: unknown, input: unknown }[] = []
  const visit = (node: unknown): void => {
    if (!isNode(node)) return
    if (node.type === 'calculationBlock') {
      const attrs = isNode(node.attrs) ? node.attrs : {}
      found.push({ blockId: attrs.blockId, kind: attrs.kind, title: attrs.title, input: attrs.input })
      return
    }
    if (Array.isArray(node.content)) for (const child of node.content) visit(child)
  }
  visit(content)
  return found
}

/**
 * Evaluates every calculation block of an editor document with the shared engine, in document
 * order. Throws CalculationBlockError naming every block that has no id, a duplicate id, or
 * an input the engine refuses: we refuse to sign a record whose numbers cannot be computed.
 */
export function calculationsFromContent(content: unknown): Calculation[] {
  const problems: CalculationBlockProblem[] = []
  const calculations: Calculation[] = []
  const seen = new Set<string>()
  calculationBlocksOf(content).forEach((block, index) => {
    const title = typeof block.title === 'string' ? block.title : ''
    const blockId = typeof block.blockId === 'string' && block.blockId.length > 0 ? block.blockId : null
    const problem = (message: string) => problems.push({ blockId, title, position: index + 1, message })
    if (blockId === null) return problem('it has no block id')
    if (seen.has(blockId)) return problem('another block has the same id')
    seen.add(blockId)
    if (typeof block.kind !== 'string') return problem('it names no calculation kind')
    try {
      const evaluated = evaluate({ kind: block.kind, input: block.input })
      // canonicalJson refuses values JSON would alter (typed arrays, BigInt, NaN); after that the
      // JSON round trip only drops undefined properties, which canonical JSON drops as well. The
      // engine's result is JSON by construction: its long columns are typed arrays that write
      // themselves as JSON arrays (shared/thermo/columns.ts), so it is checked in its JSON form.
      const result = JSON.parse(JSON.stringify(evaluated.result))
      canonicalJson(result)
      canonicalJson(block.input)
      calculations.push({
        blockId,
        kind: block.kind,
        input: JSON.parse(JSON.stringify(block.input)),
        result,
        engineVersion: evaluated.engineVersion,
        warnings: [...evaluated.warnings],
      })
    } catch (error) {
      if (error instanceof EngineInputError) return problem(error.message)
      problem(error instanceof Error ? error.message : String(error))
    }
  })
  if (problems.length > 0) throw new CalculationBlockError(problems)
  return calculations
}

/** What the record of an entry version is made of: the entry as stored, its notebook and files. */
export interface EntryRecordSource {
  entry: { id: string, title: string, content: unknown, version: number, supersedesVersion: number | null }
  notebook: { id: string, name: string }
  attachments: readonly Attachment[]
}

/**
 * The canonical record of one entry version (DESIGN.md "The signed record" §1). Browser and
 * server call this with the same stored data and get the same recordHash. Throws
 * CalculationBlockError for a block that does not compute, or an Error naming an invalid field.
 */
export function buildEntryRecord({ entry, notebook, attachments }: EntryRecordSource): RecordDocument {
  return buildRecord({
    entry: {
      id: entry.id,
      notebook: { id: notebook.id, name: notebook.name },
      version: entry.version,
      supersedes: entry.supersedesVersion,
      title: entry.title,
      content: entry.content as Record<string, never>,
    },
    attachments: attachments.map(({ name, mediaType, size, sha256 }) => ({ name, mediaType, size, sha256 })),
    calculations: calculationsFromContent(entry.content),
  })
}
