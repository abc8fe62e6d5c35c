import { z } from 'zod'
import { withoutHiddenCharacters } from './text'

export const uuidSchema = z.uuid({ error: 'expected an id (UUID)' })

export const createNotebookSchema = z.object({
  name: withoutHiddenCharacters(z.string({ error: 'expected a name' }).trim().min(1, 'a name is needed').max(120, 'at most 120 characters')),
  description: z.string({ error: 'expected text' }).trim().max(2000, 'at most 2000 characters').default(''),
  memberIds: z.array(uuidSchema, { error: 'expected a list of person ids' }).max(500).default([]),
})

export const setMembersSchema = z.object({
  memberIds: z.array(uuidSchema, { error: 'expected a list of person ids' }).max(500),
})
