/** Public: the description integrators read before they hold a token. */
export default defineEventHandler((event) => {
  const url = getRequestURL(event)
  return integrationOpenApi(process.env.THERMOTOME_PUBLIC_URL ?? url.origin)
})
