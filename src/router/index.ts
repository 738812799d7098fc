import { createRouter, createWebHistory, type RouteLocationNormalized } from 'vue-router'
import { useAuthStore } from '../stores/auth'
import { buildRoutes, homeRouteFor, named, navigationFor } from './routes'
import { earlyData } from './early-data'
import { fetchEarly, forgetEarly } from '../api/client'
import type { Role } from '../../shared/schemas/auth'

export { homeRouteFor, named, safeRedirect, routeNames, type RouteName } from './routes'

export const routes = buildRoutes()

export const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
})

/**
 * Starts fetching the page's own code (a lazy route) while the session is asked for, instead of after
 * it: the two round trips of a first load then overlap. The router imports the same module again
 * once the guard has answered and gets it from the module cache.
 */
function prefetchComponents(to: RouteLocationNormalized): void {
  for (const record of to.matched) {
    const c = record.components?.default
    if (typeof c === 'function') void Promise.resolve((c as () => unknown)()).catch(() => {})
  }
}

router.beforeEach(async (to) => {
  const auth = useAuthStore()
  if (!auth.loaded) prefetchComponents(to)
  await auth.ensureLoaded()
  if (to.name === 'home') return named(auth.homeRoute)
  if (to.meta.guestOnly && auth.user) return named(auth.homeRoute)
  if (to.meta.public) return true
  if (!auth.user) return { name: 'sign-in', query: { redirect: to.fullPath } }
  if (to.meta.roles && !to.meta.roles.includes(auth.user.role)) return named(homeRouteFor(auth.user.role))
  // the page's first data is asked for now, beside its code, not after the page has mounted
  forgetEarly()
  fetchEarly(earlyData(to))
  return true
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Roomwright` : 'Roomwright'
})

/** Drawer entries for a role, taken from each route's meta.nav and meta.roles. */
export function navigationForRole(role: Role) {
  return navigationFor(routes, role)
}
