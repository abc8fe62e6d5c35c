export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  return { person }
})
