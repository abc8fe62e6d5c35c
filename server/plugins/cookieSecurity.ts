import type { TLSSocket } from 'node:tls'

/**
 * Session cookies are HttpOnly and SameSite=Lax always (nuxt.config.ts), and Secure whenever the
 * request came over HTTPS (see cookieRequestIsHttps). The flag is decided per request: a
 * server reached both through an HTTPS proxy and on plain loopback HTTP gets each right.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('request', (event) => {
    const https = cookieRequestIsHttps({
      encrypted: Boolean((event.node.req.socket as TLSSocket | undefined)?.encrypted),
      publicUrl: process.env.THERMOTOME_PUBLIC_URL,
      trustProxy: process.env.THERMOTOME_TRUST_PROXY === '1',
      forwardedProto: getRequestHeader(event, 'x-forwarded-proto'),
    })
    if (!https)
      return
    const response = event.node.res
    const setHeader = response.setHeader.bind(response)
    response.setHeader = ((name: string, value: number | string | readonly string[]) => {
      if (name.toLowerCase() === 'set-cookie')
        value = Array.isArray(value) ? value.map(v => cookieWithSecure(String(v))) : cookieWithSecure(String(value))
      return setHeader(name, value)
    }) as typeof response.setHeader
  })
})
