import { DEMO_PASSWORD, DEMO_PEOPLE } from '#shared/demo'

/** The demo lab's sign-in details, only when the server runs in demo mode. */
export default defineEventHandler(() => {
  if (!useRuntimeConfig().demoMode)
    throw createError({ statusCode: 404, message: 'Not in demo mode.' })
  return { password: DEMO_PASSWORD, people: DEMO_PEOPLE.map(p => ({ email: p.email, name: p.name, roles: p.roles })) }
})
