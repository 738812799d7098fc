import { defineStore } from 'pinia'
import { computed, ref, shallowRef } from 'vue'
import { useRouter } from 'vue-router'
import type { LoginInput, RegisterInput, Role, User } from '../../shared/schemas/auth'
import * as authApi from '../api/auth'
import { onUnauthorized } from '../api/client'
import { homeRouteFor, type RouteName } from '../router/routes'

export const useAuthStore = defineStore('auth', () => {
  const router = useRouter()
  if (!router) throw new Error('useAuthStore needs the router installed before the store is first used')

  const user = ref<User | null>(null)
  const loaded = ref(false)
  let loading: Promise<void> | null = null

  const role = computed<Role | null>(() => user.value?.role ?? null)
  const homeRoute = computed<RouteName>(() => homeRouteFor(role.value))

  /** Asks the server who is signed in (GET /api/auth/me). A server that cannot be reached counts as signed out. */
  async function loadMe(): Promise<void> {
    try {
      user.value = await authApi.getMe()
    } catch {
      user.value = null
    } finally {
      loaded.value = true
    }
  }

  /** loadMe once per page load; route guards await this. */
  function ensureLoaded(): Promise<void> {
    loading ??= loadMe()
    return loading
  }

  async function login(input: LoginInput): Promise<User> {
    user.value = await authApi.login(input)
    return user.value
  }

  async function register(input: RegisterInput): Promise<User> {
    user.value = await authApi.register(input)
    return user.value
  }

  async function logout(): Promise<void> {
    await authApi.logout()
    user.value = null
  }

  onUnauthorized(() => {
    user.value = null
    const current = router.currentRoute.value
    if (!current.meta.public) void router.push({ name: 'sign-in', query: { redirect: current.fullPath } })
  })

  return { user, loaded, role, homeRoute, loadMe, ensureLoaded, login, register, logout }
})
