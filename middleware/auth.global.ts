import type { RoleName } from '#shared/schemas/people'

declare module '#app' {
  interface PageMeta {
    /** Pages open to visitors who are not signed in. */
    public?: boolean
    /** At least one of these roles is needed to open the page. */
    roles?: RoleName[]
  }
}

/** Client-side guard for pages; every API route checks again on the server. */
export default defineNuxtRouteMiddleware(async (to) => {
  const session = useSessionStore()
  await session.load()
  if (to.meta.public)
    return
  if (!session.signedIn) {
    // Embedded pages sign in inside the frame: the ordinary sign-in page refuses framing.
    const signInPath = to.path.startsWith('/embed') ? '/embed/signin' : '/signin'
    return navigateTo({ path: signInPath, query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  }
  if (to.meta.roles && !session.hasRole(...to.meta.roles))
    return abortNavigation(createError({ statusCode: 403, message: `This page needs the ${to.meta.roles.join(' or ')} role.` }))
})
