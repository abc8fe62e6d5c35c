import { z } from 'zod'
import { entryTitleSchema } from './entries'

/** Body of POST /api/v1/notebooks/{id}/entries: an entry made by a host system. */
export const v1CreateEntrySchema = z.object({
  title: entryTitleSchema,
  text: z.string({ error: 'expected text' }).max(100_000, 'at most 100,000 characters').optional()
    .describe('Plain text; blank lines separate paragraphs.'),
  blocks: z.array(z.object({
    kind: z.string({ error: 'expected a calculation kind' }).min(1).max(60),
    title: z.string({ error: 'expected a title' }).trim().max(200, 'at most 200 characters').optional(),
    input: z.record(z.string(), z.unknown(), { error: 'expected the block input as an object' }),
  }), { error: 'expected a list of calculation blocks' }).max(100, 'at most 100 blocks').default([]),
})

export const v1EvaluateSchema = z.object({
  kind: z.string({ error: 'expected a calculation kind' }).min(1).max(60),
  input: z.record(z.string(), z.unknown(), { error: 'expected the input as an object' }),
})
