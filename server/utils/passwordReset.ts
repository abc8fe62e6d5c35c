import { createHash, randomBytes } from 'node:crypto'
import { and, eq, isNull } from 'drizzle-orm'
import { PASSWORD_RESET_HOURS } from '#shared/schemas/people'
import { passwordResets } from '../database/schema'
import type { SessionPerson } from './auth'
import type { Database } from './db'

// One-time password links. Administrators never set a password: a link is mailed to the
// person, who sets it on /reset-password. Only the token's SHA-256 is stored; the token
// travels in the link's fragment (#token=…), which browsers never send to a server, so it
// stays out of access logs and Referer headers.

export function hashResetToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex')
}

/**
 * A new link for the person, closing every older unused one. Call inside the transaction that
 * records why (person created, reset asked for); mail the token after it commits.
 */
export async function passwordResetIssue(tx: Pick<Database, 'insert' | 'update'>, personId: string, requestedBy: string | null) {
  const token = randomBytes(32).toString('base64url')
  const now = new Date()
  const expiresAt = new Date(now.getTime() + PASSWORD_RESET_HOURS * 3600_000)
  await tx.update(passwordResets).set({ usedAt: now })
    .where(and(eq(passwordResets.personId, personId), isNull(passwordResets.usedAt)))
  await tx.insert(passwordResets).values({ personId, tokenHash: hashResetToken(token), requestedBy, createdAt: now, expiresAt })
  return { token, expiresAt }
}

/** Mails the link; a failed send is audited (mail_failed) and reported as false. */
export async function passwordResetMail(actor: SessionPerson, to: { id: string, name: string, email: string }, token: string, expiresAt: Date, first: boolean) {
  const link = mailLink(`/reset-password#token=${token}`)
  const text = [
    `Hello ${to.name},`,
    '',
    first
      ? `${actor.name} has made you a Thermotome account. Choose your password here:`
      : `${actor.name} has sent you a link to set a new Thermotome password:`,
    '',
    link,
    '',
    `The link works once, until ${expiresAt.toISOString().slice(0, 16).replace('T', ' ')} UTC. Nobody else (administrators included) learns the password you choose.`,
    first ? '' : 'If you did not expect this, you can ignore it: your password stays as it is until the link is used.',
  ].join('\n')
  return mailSendAudited(
    { to: to.email, subject: first ? 'Your Thermotome account: choose a password' : 'Set a new Thermotome password', text },
    { actor, subjectType: 'person', subjectId: to.id, purpose: first ? 'first password link' : 'password reset link' },
  )
}
