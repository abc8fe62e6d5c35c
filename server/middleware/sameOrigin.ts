/**
 * Refuse state-changing requests sent by another site's page (a CSRF guard that adds to the
 * SameSite=Lax session cookie). Bearer-token routes under /api/v1 carry no cookie and are
 * exempt. This middleware only refuses; it never answers a request itself.
 */
export default defineEventHandler((event) => {
  const method = event.method
  if (method === 'GET' || method === 'HEAD' || method === 'OPTIONS')
    return
  if (!event.path.startsWith('/api/') || event.path.startsWith('/api/v1/'))
    return
  const fetchSite = getRequestHeader(event, 'sec-fetch-site')
  if (fetchSite === 'cross-site')
    throw createError({ statusCode: 403, message: 'Requests from another site are refused.' })
  const origin = getRequestHeader(event, 'origin')
  if (origin && origin !== 'null') {
    const host = getRequestHeader(event, 'x-forwarded-host') && process.env.THERMOTOME_TRUST_PROXY === '1'
      ? getRequestHeader(event, 'x-forwarded-host')
      : getRequestHeader(event, 'host')
    let originHost: string
    try { originHost = new URL(origin).host }
    catch { throw createError({ statusCode: 403, message: 'Requests from another site are refused.' }) }
    if (originHost !== host)
      throw createError({ statusCode: 403, message: 'Requests from another site are refused.' })
  }
  else if (origin === 'null') {
    throw createError({ statusCode: 403, message: 'Requests from another site are refused.' })
  }
})
