import { z } from 'zod'
import { withoutHiddenCharacters } from './text'

import { VERSION_STATUSES, type VersionStatus } from '../records/lifecycle'

/** The states a version can show (the rule that derives them is shared/records/lifecycle.ts). */
export const ENTRY_STATES = VERSION_STATUSES
export type EntryStateName = VersionStatus

/** Words shown beside each state's colour (DESIGN.md: colour never stands alone). */
export const ENTRY_STATE_WORDS: Record<EntryStateName, string> = {
  draft: 'Draft',
  awaiting_witness: 'Signed — awaiting witness',
  witnessed: 'Witnessed',
  declined: 'Declined',
  superseded: 'Superseded',
}

export const ENTRY_SORT_FIELDS = ['title', 'updatedAt', 'createdAt', 'state', 'author'] as const

export const entryListQuerySchema = z.object({
  page: z.coerce.number({ error: 'expected a page number' }).int('expected a whole page number').min(1, 'pages start at 1').max(100000).default(1),
  pageSize: z.coerce.number({ error: 'expected a page size' }).int('expected a whole number').min(1, 'at least 1').max(100, 'at most 100').default(20),
  sort: z.enum(ENTRY_SORT_FIELDS, { error: `expected one of ${ENTRY_SORT_FIELDS.join(', ')}` }).default('updatedAt'),
  direction: z.enum(['asc', 'desc'], { error: 'expected asc or desc' }).default('desc'),
  q: z.string().trim().max(200, 'at most 200 characters').optional(),
  state: z.enum(ENTRY_STATES, { error: `expected one of ${ENTRY_STATES.join(', ')}` }).optional(),
  author: z.uuid({ error: 'expected a person id (UUID)' }).optional(),
})

export const entryTitleSchema = withoutHiddenCharacters(z.string({ error: 'expected a title' }).trim().min(1, 'a title is needed').max(200, 'at most 200 characters'))

/** Editor JSON (a TipTap/ProseMirror document). The rich editor issue narrows the node types. */
export const editorDocumentSchema = z.object({
  type: z.literal('doc', { error: "expected an editor document of type 'doc'" }),
  content: z.array(z.record(z.string(), z.unknown()), { error: 'expected a list of nodes' }).max(5000).optional(),
}).loose()

export const emptyDocument = () => ({ type: 'doc', content: [{ type: 'paragraph' }] })

export const createEntrySchema = z.object({
  title: entryTitleSchema,
  content: editorDocumentSchema.optional(),
})

export const updateEntrySchema = z.object({
  lockVersion: z.number({ error: 'expected the lock version the edit started from' }).int().min(1),
  title: entryTitleSchema.optional(),
  content: editorDocumentSchema.optional(),
})
