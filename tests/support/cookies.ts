/**
 * The cookie jar of the test and hardening clients: the jar ("a=1; b=2") after a response's
 * Set-Cookie headers, a cookie set again replacing the old one and an emptied cookie removed.
 */
export function rememberCookies(jar: string, setCookies: string[]): string {
  let cookies = jar
  for (const cookie of setCookies) {
    const pair = cookie.split(';')[0]!
    const [name] = pair.split('=')
    const others = cookies.split('; ').filter(c => c && !c.startsWith(`${name}=`))
    cookies = [...others, pair].filter(c => !c.endsWith('=')).join('; ')
  }
  return cookies
}
