import { z } from 'zod'
import { parseTable } from '#shared/import/csv'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })
const querySchema = z.object({
  rows: z.coerce.number({ error: 'expected a number of rows' }).int('expected a whole number of rows').min(1, 'at least 1').max(1000, 'at most 1000').default(50),
  delimiter: z.enum(['auto', 'comma', 'tab', 'semicolon', 'bar', 'spaces'], { error: 'expected auto, comma, tab, semicolon, bar or spaces' }).default('auto'),
})

const DELIMITERS = { auto: 'auto', comma: ',', tab: '\t', semicolon: ';', bar: '|', spaces: ' ' } as const

/** The first rows of a CSV, TSV or text file as a table, for the import dialog. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const query = validQuery(event, querySchema)
  const { attachment } = await readableAttachment(person, id)
  if (attachment.mediaType === 'application/json')
    throw createError({ statusCode: 415, message: 'A JSON file has no table to preview: choose a CSV, TSV or text file.' })
  const bytes = await verifiedAttachmentBytes(person, attachment)
  const table = parseTable(bytes.toString('utf8'), { delimiter: DELIMITERS[query.delimiter], maxRows: query.rows })
  return { attachmentId: attachment.id, name: attachment.name, ...table }
})
