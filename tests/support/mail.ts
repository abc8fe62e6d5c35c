import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { inject } from 'vitest'
import { Client } from './http'

export interface CaughtMail { to: string[], subject: string, text: string }

/** Messages the test setup's mail catcher kept for one recipient. */
export function caughtMail(recipient: string): CaughtMail[] {
  const folder = inject('mailDir')
  let names: string[] = []
  try { names = readdirSync(folder).filter(name => name.endsWith('.json')).sort() }
  catch { return [] }
  return names.map(name => JSON.parse(readFileSync(join(folder, name), 'utf8')) as CaughtMail).filter(message => message.to.includes(recipient))
}

/** The newest caught message to the recipient whose subject matches, waiting up to 4 s. */
export async function waitForMail(recipient: string, subject: RegExp, after = 0): Promise<CaughtMail> {
  for (let attempt = 0; attempt < 40; attempt++) {
    const found = caughtMail(recipient).filter(message => subject.test(message.subject))
    if (found.length > after) return found[found.length - 1]!
    await new Promise(resolve => setTimeout(resolve, 100))
  }
  throw new Error(`no mail to ${recipient} matching ${subject}`)
}

/** The one-time token in a password link (…/reset-password#token=…). */
export function resetTokenIn(message: CaughtMail): string {
  const match = /\/reset-password#token=([A-Za-z0-9_-]+)/.exec(message.text)
  if (!match) throw new Error(`no password link in: ${message.text}`)
  return match[1]!
}

let serial = 0
/**
 * A new person made by an administrator the only way there is: the admin adds them, the
 * first-password link is mailed to them, and they set the password with it.
 */
export async function createPersonWithPassword(admin: Client, roles: string[], password = 'a long enough password') {
  const email = `person.${Date.now()}.${serial++}@kestrel-ridge.example`
  const created = await admin.post('/api/people', { email, name: `Test Person ${serial}`, roles })
  if (created.status !== 201) throw new Error(`create person: ${created.status} ${JSON.stringify(created.body)}`)
  const token = resetTokenIn(await waitForMail(email, /choose a password/))
  const set = await new Client('192.0.2.200').post('/api/auth/password-reset', { token, password })
  if (set.status !== 200) throw new Error(`set password: ${set.status} ${JSON.stringify(set.body)}`)
  return { id: created.body.person.id as string, email, password }
}
