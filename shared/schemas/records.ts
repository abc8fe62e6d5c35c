import { z } from 'zod'

// Queries of the records workspace and bulk exports, shared by the page and the routes.

export const RECORD_STATES = ['awaiting_witness', 'witnessed', 'declined', 'superseded'] as const
export const RECORD_SORTS = ['signedAt', 'title', 'notebook', 'author', 'state', 'version'] as const

const uuid = (what: string) => z.uuid({ error: `expected ${what} id (UUID)` })
const isoTime = z.iso.datetime({ error: 'expected an ISO 8601 date and time such as 2026-01-31T00:00:00Z', offset: true })

/** Filters that select signed records; used by the search and by a date-range bulk export. */
export const recordFiltersSchema = z.object({
  notebookId: uuid('a notebook').optional(),
  authorId: uuid('a person').optional(),
  witnessId: uuid('a person').optional(),
  state: z.enum(RECORD_STATES, { error: `expected one of ${RECORD_STATES.join(', ')}` }).optional(),
  from: isoTime.optional(),
  to: isoTime.optional(),
  q: z.string().trim().max(200, 'at most 200 characters').optional(),
})
export type RecordFilters = z.infer<typeof recordFiltersSchema>

export const recordSearchSchema = recordFiltersSchema.extend({
  page: z.coerce.number({ error: 'expected a page number' }).int().min(1, 'pages start at 1').max(100_000).default(1),
  pageSize: z.coerce.number({ error: 'expected a page size' }).int().min(1).max(200, 'at most 200').default(25),
  sort: z.enum(RECORD_SORTS, { error: `expected one of ${RECORD_SORTS.join(', ')}` }).default('signedAt'),
  direction: z.enum(['asc', 'desc'], { error: 'expected asc or desc' }).default('desc'),
})

export const versionQuerySchema = z.object({
  version: z.coerce.number({ error: 'expected a version number' }).int('expected a whole version number').min(1, 'versions start at 1').max(1_000_000).optional(),
})

export const MAX_EXPORT_RECORDS = 5000

/** A bulk export: chosen records, or every record the filters (e.g. a date range) select. */
export const exportRequestSchema = z.strictObject({
  records: z.array(z.strictObject({ entryId: uuid('an entry'), version: z.int({ error: 'expected a version number' }).min(1) }), { error: 'expected a list of {entryId, version}' })
    .min(1, 'choose at least one record').max(MAX_EXPORT_RECORDS, `at most ${MAX_EXPORT_RECORDS} records per export`).optional(),
  filters: recordFiltersSchema.optional(),
}).refine(request => (request.records === undefined) !== (request.filters === undefined), {
  message: 'give either records (a selection) or filters (such as a date range), not both or neither',
  path: ['records'],
})
export type ExportRequest = z.infer<typeof exportRequestSchema>
