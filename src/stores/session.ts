import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import * as api from '../api/http'
import type { User } from '../api/http'

export const useSessionStore = defineStore('session', () => {
  const user = ref<User | null>(null)
  /** True once the server has told us who we are (or that we are signed out). */
  const loaded = ref(false)
  const signedIn = computed(() => user.value !== null)
  let pending: Promise<void> | null = null

  /** Ask the server who is signed in; runs once unless forced, concurrent callers share the call. */
  function load(force = false): Promise<void> {
    if (loaded.value && !force) return Promise.resolve()
    pending ??= api
      .me()
      .then((u) => {
        user.value = u
        loaded.value = true
      })
      .finally(() => {
        pending = null
      })
    return pending
  }

  /** Sign in with e-mail and password; rejects with ApiError ('bad_credentials', 'rate_limited', …). */
  async function signIn(email: string, password: string): Promise<User> {
    user.value = await api.signIn({ email: email.trim(), password })
    loaded.value = true
    return user.value
  }

  /** Create an account; the server signs it in straight away. */
  async function signUp(email: string, name: string, password: string): Promise<User> {
    user.value = await api.signUp({ email: email.trim(), name: name.trim(), password })
    loaded.value = true
    return user.value
  }

  /** Sign out on the server, then forget the user here even if the server call failed. */
  async function signOut(): Promise<void> {
    try {
      await api.signOut()
    } finally {
      user.value = null
    }
  }

  return { user, loaded, signedIn, load, signIn, signUp, signOut }
})
