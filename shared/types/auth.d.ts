// The session carries only public facts; the server re-reads roles from the database.
declare module '#auth-utils' {
  interface User {
    id: string
    email: string
    name: string
    roles: ('scientist' | 'witness' | 'compliance' | 'admin')[]
  }
  interface UserSession {
    /** The person's session epoch when this session was sealed (server/utils/auth.ts). */
    epoch?: number
    signedInAt?: string
  }
}

export {}
