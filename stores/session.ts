import { defineStore } from 'pinia'
import type { RoleName } from '#shared/schemas/people'

export interface SignedInPerson {
  id: string
  email: string
  name: string
  roles: RoleName[]
}

/** The signed-in person, shared by the whole app. The server remains the real check. */
export const useSessionStore = defineStore('session', {
  state: () => ({
    person: null as SignedInPerson | null,
    loaded: false,
  }),
  getters: {
    signedIn: state => state.person !== null,
    hasRole: state => (...roles: RoleName[]) => Boolean(state.person && roles.some(r => state.person!.roles.includes(r))),
  },
  actions: {
    async load(force = false) {
      if (this.loaded && !force)
        return this.person
      const fetcher = useRequestFetch()
      try {
        const { person } = await fetcher<{ person: SignedInPerson }>('/api/auth/me')
        this.person = person
      }
      catch {
        this.person = null
      }
      this.loaded = true
      return this.person
    },
    async signIn(email: string, password: string) {
      const { person } = await $fetch<{ person: SignedInPerson }>('/api/auth/login', { method: 'POST', body: { email, password } })
      this.person = person
      this.loaded = true
      return person
    },
    async signOut() {
      await $fetch('/api/auth/logout', { method: 'POST' })
      this.person = null
      this.loaded = true
    },
  },
})
