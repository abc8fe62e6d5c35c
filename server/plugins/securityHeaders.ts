/**
 * Security headers on every answer, and a Content-Security-Policy on pages that allows only
 * this origin plus the hashes of the page's own inline scripts. Framing is refused except
 * for /embed pages, which allow the configured host origins.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('request', (event) => {
    setResponseHeaders(event, {
      'X-Content-Type-Options': 'nosniff',
      'Referrer-Policy': 'same-origin',
      'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=()',
      'Cross-Origin-Opener-Policy': 'same-origin',
    })
    const path = event.path.split('?')[0]!
    if (!isEmbedPath(path))
      setResponseHeader(event, 'X-Frame-Options', 'DENY')
    if (path.startsWith('/api/'))
      setResponseHeader(event, 'Content-Security-Policy', "default-src 'none'; frame-ancestors 'none'")
    else
      // Redirects and error answers that never reach render:html get the page policy too
      // (with no inline script allowed); rendered pages replace it with their hashes below.
      setResponseHeader(event, 'Content-Security-Policy', contentSecurityPolicy(path, []))
  })

  nitroApp.hooks.hook('render:html', (html, { event }) => {
    const hashes = inlineScriptHashes([...html.head, ...html.bodyPrepend, ...html.body, ...html.bodyAppend])
    setResponseHeader(event, 'Content-Security-Policy', contentSecurityPolicy(event.path.split('?')[0]!, hashes))
  })
})
