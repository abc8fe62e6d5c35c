import { listKinds } from '#shared/thermo'

/** The calculation kinds with titles and descriptions, for the block picker. */
export default defineEventHandler(async (event) => {
  await requirePerson(event)
  return { kinds: listKinds() }
})
