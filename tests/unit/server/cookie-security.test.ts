import { describe, expect, it } from 'vitest'
import { cookieRequestIsHttps, cookieWithSecure } from '../../../server/utils/cookieSecurity'

describe('cookieRequestIsHttps', () => {
  const plain = { encrypted: false, trustProxy: false }
  it('is false for plain HTTP with no hints', () => {
    expect(cookieRequestIsHttps(plain)).toBe(false)
  })
  it('is true on a TLS socket', () => {
    expect(cookieRequestIsHttps({ ...plain, encrypted: true })).toBe(true)
  })
  it('follows THERMOTOME_PUBLIC_URL when it is https', () => {
    expect(cookieRequestIsHttps({ ...plain, publicUrl: 'https://notebook.lab.example' })).toBe(true)
    expect(cookieRequestIsHttps({ ...plain, publicUrl: 'http://notebook.lab.example' })).toBe(false)
  })
  it('believes X-Forwarded-Proto only behind a trusted proxy, first hop first', () => {
    expect(cookieRequestIsHttps({ ...plain, forwardedProto: 'https' })).toBe(false)
    expect(cookieRequestIsHttps({ ...plain, trustProxy: true, forwardedProto: 'https' })).toBe(true)
    expect(cookieRequestIsHttps({ ...plain, trustProxy: true, forwardedProto: 'HTTPS, http' })).toBe(true)
    expect(cookieRequestIsHttps({ ...plain, trustProxy: true, forwardedProto: 'http, https' })).toBe(false)
  })
})

describe('cookieWithSecure', () => {
  it('adds Secure once', () => {
    expect(cookieWithSecure('a=b; Path=/; HttpOnly')).toBe('a=b; Path=/; HttpOnly; Secure')
    expect(cookieWithSecure('a=b; Secure; HttpOnly')).toBe('a=b; Secure; HttpOnly')
    expect(cookieWithSecure('a=b; secure')).toBe('a=b; secure')
  })
})
