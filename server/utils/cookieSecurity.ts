/**
 * Whether a request reached us over HTTPS: the socket is TLS, or THERMOTOME_PUBLIC_URL says the
 * public address is https, or (only behind a trusted proxy, THERMOTOME_TRUST_PROXY=1) the
 * proxy says so with X-Forwarded-Proto. Cookies set on such requests get the Secure flag.
 */
export function cookieRequestIsHttps(facts: { encrypted: boolean, publicUrl?: string, trustProxy: boolean, forwardedProto?: string }): boolean {
  if (facts.encrypted)
    return true
  if (facts.publicUrl && /^https:\/\//i.test(facts.publicUrl.trim()))
    return true
  if (facts.trustProxy && facts.forwardedProto) {
    // A chain of proxies lists the first hop's scheme first.
    return facts.forwardedProto.split(',')[0]!.trim().toLowerCase() === 'https'
  }
  return false
}

/** A Set-Cookie value with `; Secure` added when it lacks it. */
export function cookieWithSecure(value: string): string {
  return /;\s*secure\s*(;|$)/i.test(value) ? value : `${value}; Secure`
}
