import { z } from 'zod'

export const ROLES = ['scientist', 'witness', 'compliance', 'admin'] as const
export type RoleName = (typeof ROLES)[number]

export const ROLE_TITLES: Record<RoleName, string> = {
  scientist: 'Scientist',
  witness: 'Witness',
  compliance: 'Records officer',
  admin: 'Administrator',
}

export const PASSWORD_MIN_LENGTH = 12

export const emailSchema = z.string({ error: 'expected an e-mail address' })
  .trim().toLowerCase().max(254, 'at most 254 characters')
  .pipe(z.email({ error: 'expected an e-mail address such as name@lab.example' }))

export const passwordSchema = z.string({ error: 'expected a password' })
  .min(PASSWORD_MIN_LENGTH, `at least ${PASSWORD_MIN_LENGTH} characters`)
  .max(512, 'at most 512 characters')

export const personNameSchema = z.string({ error: 'expected a name' }).trim()
  .min(1, 'a name is needed').max(120, 'at most 120 characters')

export const rolesSchema = z.array(z.enum(ROLES, { error: `expected one of ${ROLES.join(', ')}` }), { error: 'expected a list of roles' })
  .max(ROLES.length).transform(roles => [...new Set(roles)].sort())

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'expected a password' }).min(1, 'a password is needed').max(512, 'at most 512 characters'),
})

/** Hours a mailed password link works (a first-password link for a new person, or a reset). */
export const PASSWORD_RESET_HOURS = 24

const NO_PASSWORD = 'administrators never set passwords: the person gets a link by e-mail and sets their own'

// Administrators never set a password: a `password` field is refused by name, not ignored, so
// a client that still sends one learns that it was not used.
export const createPersonSchema = z.object({
  email: emailSchema,
  name: personNameSchema,
  roles: rolesSchema,
  password: z.never({ error: NO_PASSWORD }).optional(),
})

export const updatePersonSchema = z.object({
  name: personNameSchema.optional(),
  roles: rolesSchema.optional(),
  disabled: z.boolean({ error: 'expected true or false' }).optional(),
  password: z.never({ error: NO_PASSWORD }).optional(),
}).refine(value => Object.values(value).some(v => v !== undefined), { message: 'nothing to change: give name, roles or disabled' })

/** Setting a password with a mailed one-time link (no session needed). */
export const passwordResetSchema = z.object({
  token: z.string({ error: 'expected the token from the link' }).min(20, 'expected the token from the link').max(200, 'expected the token from the link'),
  password: passwordSchema,
})

/** A signed-in person changing their own password. */
export const passwordChangeSchema = z.object({
  currentPassword: z.string({ error: 'expected your current password' }).min(1, 'your current password is needed').max(512, 'at most 512 characters'),
  newPassword: passwordSchema,
})
