import type { H3Event } from 'h3'
import { eq, sql } from 'drizzle-orm'
import { people, personRoles, type Role } from '../database/schema'

export interface SessionPerson {
  id: string
  email: string
  name: string
  roles: Role[]
}

/** Load a person with their roles; undefined when missing. */
export async function findPerson(id: string): Promise<(SessionPerson & { disabled: boolean, sessionEpoch: number }) | undefined> {
  // One round trip (every API request comes through here): the person joined with their roles.
  const rows = await useDatabase().select({ person: people, role: personRoles.role }).from(people)
    .leftJoin(personRoles, eq(personRoles.personId, people.id)).where(eq(people.id, id))
  const person = rows[0]?.person
  if (!person)
    return undefined
  const roles = rows.map(r => r.role).filter((role): role is Role => role !== null).sort()
  return { id: person.id, email: person.email, name: person.name, disabled: person.disabled, sessionEpoch: person.sessionEpoch, roles }
}

/**
 * Seal a session for this person under their current session epoch (sign-in, and the session
 * that changed its own password). The epoch is what requirePerson compares on every request.
 */
export async function startSession(event: H3Event, person: SessionPerson & { sessionEpoch: number }) {
  await setUserSession(event, {
    user: { id: person.id, email: person.email, name: person.name, roles: person.roles },
    epoch: person.sessionEpoch,
    signedInAt: new Date().toISOString(),
  })
}

/**
 * End every session of a person, on every app server: the epoch moves on, so each cookie
 * sealed under an older one is refused at its next request. Returns the new epoch.
 */
export async function endAllSessions(database: Pick<ReturnType<typeof useDatabase>, 'update'>, personId: string): Promise<number> {
  const [row] = await database.update(people).set({ sessionEpoch: sql`${people.sessionEpoch} + 1` })
    .where(eq(people.id, personId)).returning({ sessionEpoch: people.sessionEpoch })
  return row?.sessionEpoch ?? 0
}

/**
 * The signed-in person, re-read from the database on every request so that a role change
 * or a disabled account takes effect at once, even with a sealed cookie still alive. A cookie
 * sealed under an older session epoch (the person signed out somewhere, or changed their
 * password, since) is refused like no cookie at all.
 * 401 when signed out (always before any validation of the request).
 */
export async function requirePerson(event: H3Event): Promise<SessionPerson> {
  if (event.context.person)
    return event.context.person as SessionPerson
  const session = await getUserSession(event)
  const id = (session.user as { id?: string } | undefined)?.id
  if (!id)
    throw createError({ statusCode: 401, message: 'Sign in first.' })
  const person = await findPerson(id)
  if (!person || person.disabled || session.epoch !== person.sessionEpoch) {
    await clearUserSession(event)
    throw createError({
      statusCode: 401,
      message: person?.disabled ? 'This account is disabled.' : person ? 'This session has ended (signed out or password changed). Sign in again.' : 'Sign in first.',
    })
  }
  const { disabled: _disabled, sessionEpoch: _epoch, ...current } = person
  event.context.person = current
  return current
}

/** 401 when signed out, 403 unless the person holds at least one of the roles. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<SessionPerson> {
  const person = await requirePerson(event)
  if (!roles.some(role => person.roles.includes(role)))
    throw createError({ statusCode: 403, message: `This needs the ${roles.join(' or ')} role.` })
  return person
}

export function hasRole(person: SessionPerson, ...roles: Role[]): boolean {
  return roles.some(role => person.roles.includes(role))
}

/** Compliance and admin read every notebook; others only those they belong to. */
export function readsAllNotebooks(person: SessionPerson): boolean {
  return hasRole(person, 'compliance', 'admin')
}
