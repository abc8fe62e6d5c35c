import { z } from 'zod'

/** What a host system's token may do. */
export const TOKEN_SCOPES = ['records:read', 'entries:write', 'records:export'] as const
export type TokenScope = (typeof TOKEN_SCOPES)[number]

export const TOKEN_SCOPE_WORDS: Record<TokenScope, string> = {
  'records:read': 'Read notebooks, entries and records',
  'entries:write': 'Create entries with calculation blocks',
  'records:export': 'Fetch record bundles and signed PDFs',
}

/**
 * Scopes an administrator may give a token that acts for someone else. Writing entries and
 * taking records out act in that person's name, so they need the person's own consent: the
 * person makes such a token themselves (POST /api/tokens, "My API tokens").
 */
export const SCOPES_WITHOUT_CONSENT: readonly TokenScope[] = ['records:read']

export const createTokenSchema = z.object({
  name: z.string({ error: 'expected a name for the token' }).trim().min(1, 'a name is needed').max(120, 'at most 120 characters'),
  actsFor: z.uuid({ error: 'expected the id of the person the token acts for' }),
  scopes: z.array(z.enum(TOKEN_SCOPES, { error: `expected scopes among ${TOKEN_SCOPES.join(', ')}` }), { error: 'expected a list of scopes' })
    .min(1, 'give at least one scope').transform(scopes => [...new Set(scopes)].sort()),
})

/** A token a person makes for themselves: it acts for them, with any scope. */
export const createOwnTokenSchema = createTokenSchema.omit({ actsFor: true })
