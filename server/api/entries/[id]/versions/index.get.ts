import { asc, desc, eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entryVersions, people, signatures } from '../../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** The frozen versions of an entry, newest first, each with its status and who signed it. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const entry = await readableEntry(person, id)
  const database = useDatabase()
  const versions = await database.select({
    id: entryVersions.id, version: entryVersions.version, supersedesVersion: entryVersions.supersedesVersion,
    title: entryVersions.title, recordHash: entryVersions.recordHash, frozenAt: entryVersions.frozenAt,
  }).from(entryVersions).where(eq(entryVersions.entryId, id)).orderBy(desc(entryVersions.version))
  const signed = versions.length
    ? await database.select({
        id: signatures.id, entryVersionId: signatures.entryVersionId, meaning: signatures.meaning, signedAt: signatures.signedAt,
        signer: { id: people.id, name: people.name, email: people.email },
      }).from(signatures).innerJoin(people, eq(people.id, signatures.signerId))
        .where(inArray(signatures.entryVersionId, versions.map(v => v.id))).orderBy(asc(signatures.signedAt))
    : []
  return {
    current: { version: entry.version, state: entry.state, supersedesVersion: entry.supersedesVersion },
    versions: versions.map(({ id: versionId, ...version }) => ({
      ...version,
      // A frozen version older than the entry's current one was replaced by an amendment.
      status: lifecycleVersionStatus(version.version, entry),
      signatures: signed.filter(s => s.entryVersionId === versionId).map(({ entryVersionId: _v, ...s }) => s),
    })),
  }
})
