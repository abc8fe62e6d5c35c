import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { count, sql } from 'drizzle-orm'
import { drizzle } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import { DEMO_NOTEBOOKS, DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import * as schema from './schema'
import { auditRowHash, GENESIS_HASH } from './audit-chain'

/**
 * Seed the demo lab into an empty database (people table empty); otherwise do nothing.
 * Passwords are hashed with the same scrypt hasher, at the same defaults, that
 * nuxt-auth-utils uses, so the server verifies them.
 */
export async function seedDemoLab(databaseUrl: string): Promise<boolean> {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  try {
    const database = drizzle(client, { schema })
    return await database.transaction(async (tx) => {
      await tx.execute(sql`SELECT pg_advisory_xact_lock(874203)`)
      const [{ people } = { people: 0 }] = await tx.select({ people: count() }).from(schema.people)
      if (people > 0)
        return false
      const hasher = new Hash(new Scrypt({}))
      const passwordHash = await hasher.make(DEMO_PASSWORD)
      const ids = new Map<string, string>()
      for (const person of DEMO_PEOPLE) {
        const [row] = await tx.insert(schema.people).values({ email: person.email, name: person.name, passwordHash }).returning()
        ids.set(person.key, row!.id)
        await tx.insert(schema.personRoles).values(person.roles.map(role => ({ personId: row!.id, role })))
      }
      let day = 0
      for (const notebook of DEMO_NOTEBOOKS) {
        const [nb] = await tx.insert(schema.notebooks).values({
          name: notebook.name, description: notebook.description, createdBy: ids.get('hana')!,
        }).returning()
        await tx.insert(schema.notebookMembers).values(notebook.members.map(key => ({ notebookId: nb!.id, personId: ids.get(key)! })))
        for (const entry of notebook.entries) {
          const when = new Date(Date.UTC(2026, 10, 2 + day++, 9, 30))
          await tx.insert(schema.entries).values({
            notebookId: nb!.id, authorId: ids.get(entry.author)!, title: entry.title,
            content: entry.content, createdAt: when, updatedAt: when,
          })
        }
      }
      // The seeding itself is the first audit event.
      const [last] = await tx.select({ hash: schema.auditEvents.hash }).from(schema.auditEvents)
        .orderBy(sql`${schema.auditEvents.sequence} desc`).limit(1)
      const row = {
        occurredAt: new Date(), actorId: null, actorEmail: null, action: 'demo_lab_seeded',
        subjectType: null, subjectId: null, details: { people: DEMO_PEOPLE.length, notebooks: DEMO_NOTEBOOKS.length },
        previousHash: last?.hash ?? GENESIS_HASH,
      }
      await tx.insert(schema.auditEvents).values({ ...row, hash: auditRowHash(row) })
      return true
    })
  }
  finally {
    await client.end()
  }
}
