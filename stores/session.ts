/**
 * Who is signed in, loaded once per page load from GET /api/me (on the
 * server during SSR, forwarding the cookie) and updated by sign-in/out.
 */
import { defineStore } from 'pinia'
import type { LoginInput } from '#shared/utils/account-schemas'

export interface SessionUser {
  id: number
  email: string
  name: string
  isAdmin: boolean
}

export const useSessionStore = defineStore('session', {
  // endedMessage: why the browser's session ended (lifetime, signed out elsewhere), for the sign-in page.
  state: () => ({ user: null as SessionUser | null, loaded: false, endedMessage: '' }),
  getters: {
    signedIn: (state) => state.user !== null,
  },
  actions: {
    async refresh() {
      const fetcher = useRequestFetch()
      try {
        const answer = await fetcher<{ user: SessionUser }>('/api/me')
        this.user = answer.user
      } catch (error) {
        this.user = null
        const answer = error as { statusCode?: number, data?: { message?: string } }
        const message = answer.data?.message ?? ''
        this.endedMessage = answer.statusCode === 401 && message && !message.startsWith('Sign in to continue') ? message : ''
      }
      this.loaded = true
    },
    async login(input: LoginInput) {
      const answer = await $fetch<{ user: SessionUser }>('/api/auth/login', { method: 'POST', body: input })
      this.user = answer.user
      this.endedMessage = ''
    },
    /** Confirms a registration with the token from its mail: the account is created and signed in. */
    async confirmRegistration(token: string) {
      const answer = await $fetch<{ user: SessionUser }>('/api/auth/register/confirm', { method: 'POST', body: { token } })
      this.user = answer.user
    },
    async logout() {
      await $fetch<{ signedOut: boolean }>('/api/auth/logout', { method: 'POST' })
      this.user = null
    },
  },
})
