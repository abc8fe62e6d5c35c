import nodemailer from 'nodemailer'
import type { SessionPerson } from './auth'

// E-mail through the SMTP server named by THERMOTOME_SMTP_URL (locally the mail catcher,
// scripts/mail-catcher.ts). Mail is sent after the change it reports has committed, and a
// failed send never undoes that change: it is written to the audit trail instead.

export interface OutgoingMail {
  to: string
  subject: string
  text: string
}

let transport: ReturnType<typeof nodemailer.createTransport> | undefined
let transportUrl: string | undefined

function mailTransport() {
  const url = process.env.THERMOTOME_SMTP_URL
  if (!url)
    return undefined
  if (!transport || transportUrl !== url) {
    transport = nodemailer.createTransport(url, { connectionTimeout: 5000, greetingTimeout: 5000, socketTimeout: 10000 } as never)
    transportUrl = url
  }
  return transport
}

/** An absolute link into the app for an e-mail: THERMOTOME_PUBLIC_URL, or the local default. */
export function mailLink(path: string): string {
  const base = (process.env.THERMOTOME_PUBLIC_URL ?? 'http://127.0.0.1:3000').replace(/\/+$/, '')
  return `${base}${path.startsWith('/') ? path : `/${path}`}`
}

/** Sends one plain-text message; resolves with the outcome instead of throwing. */
export async function mailSend(message: OutgoingMail): Promise<{ sent: true } | { sent: false, error: string }> {
  const sender = mailTransport()
  if (!sender)
    return { sent: false, error: 'no SMTP server is configured (THERMOTOME_SMTP_URL)' }
  try {
    await sender.sendMail({
      from: process.env.THERMOTOME_MAIL_FROM ?? 'Thermotome <no-reply@thermotome.invalid>',
      to: message.to,
      // A title typed by a person must not start a new header line.
      subject: message.subject.replace(/[\r\n]+/g, ' ').slice(0, 200),
      text: message.text,
    })
    return { sent: true }
  }
  catch (error) {
    return { sent: false, error: error instanceof Error ? error.message : String(error) }
  }
}

/**
 * Sends a message about an entry (or another subject) and records a failed send in the audit trail
 * ('mail_failed'), so nobody is left believing a notice went out when it did not.
 */
export async function mailSendAudited(
  message: OutgoingMail,
  context: { actor: SessionPerson, purpose: string } & ({ entryId: string } | { subjectType: string, subjectId: string }),
): Promise<boolean> {
  const outcome = await mailSend(message)
  if (!outcome.sent) {
    const subject = 'entryId' in context ? { subjectType: 'entry', subjectId: context.entryId } : { subjectType: context.subjectType, subjectId: context.subjectId }
    await recordAudit(useDatabase(), {
      action: 'mail_failed', actorId: context.actor.id, actorEmail: context.actor.email,
      ...subject,
      details: { purpose: context.purpose, to: message.to, error: outcome.error.slice(0, 500) },
    }).catch((error: unknown) => console.error('[mail] could not record the failed send:', error))
  }
  return outcome.sent
}
