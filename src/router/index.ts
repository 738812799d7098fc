import { createRouter, createWebHistory } from 'vue-router'
import { useAuthStore } from '../stores/auth'
import { buildRoutes, homeRouteFor, named, navigationFor } from './routes'
import type { Role } from '../../shared/schemas/auth'

export { homeRouteFor, named, safeRedirect, routeNames, type RouteName } from './routes'

export const routes = buildRoutes()

export const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
})

router.beforeEach(async (to) => {
  const auth = useAuthStore()
  await auth.ensureLoaded()
  if (to.name === 'home') return named(auth.homeRoute)
  if (to.meta.guestOnly && auth.user) return named(auth.homeRoute)
  if (to.meta.public) return true
  if (!auth.user) return { name: 'sign-in', query: { redirect: to.fullPath } }
  if (to.meta.roles && !to.meta.roles.includes(auth.user.role)) return named(homeRouteFor(auth.user.role))
  return true
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Roomwright` : 'Roomwright'
})

/** Drawer entries for a role, taken from each route's meta.nav and meta.roles. */
export function navigationForRole(role: Role) {
  return navigationFor(routes, role)
}
