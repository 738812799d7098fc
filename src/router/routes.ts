import {
  mdiAccountGroupOutline,
  mdiChartBoxOutline,
  mdiEmailOutline,
  mdiFloorPlan,
  mdiFolderOutline,
  mdiMicrophoneOutline,
  mdiTrayFull,
} from '@mdi/js'
import type {
  LocationQueryRaw,
  RouteLocationRaw,
  RouteParamsGeneric,
  RouteParamsRawGeneric,
  RouteRecordInfo,
  RouteRecordRaw,
} from 'vue-router'
import type { Role } from '../../shared/schemas/auth'

export const routeNames = [
  'home',
  'sign-in',
  'sign-up',
  'my-cases',
  'case-new',
  'case',
  'measuring-guide',
  'rooms',
  'room-new',
  'room-edit',
  'dashboard',
  'queue',
  'case-workspace',
  'plan-editor',
  'plan-report',
  'team',
  'audit-log',
  'set-password',
  'forgot-password',
  'reset-password',
  'account',
  'mailbox',
  'not-found',
] as const

/** Params of the routes that have them; every other route takes none. */
interface RouteParamsByName {
  case: { id: string }
  'case-workspace': { id: string }
  'plan-editor': { id: string }
  'plan-report': { id: string; version: string }
  'room-edit': { id: string }
  'set-password': { token: string }
}

/** Navigate by these names only: `router.push({ name: 'queue' })`. A mistyped name fails the type check. */
export type RouteName = (typeof routeNames)[number]

declare module 'vue-router' {
  interface RouteMeta {
    /** Page title, shown in the browser tab. */
    title?: string
    /** Open to signed-out visitors. Every other route needs a session. */
    public?: boolean
    /** Only for signed-out visitors (sign-in, sign-up): a signed-in user goes to their home. */
    guestOnly?: boolean
    /** Roles allowed in; absent means any signed-in user. */
    roles?: readonly Role[]
    /** Shown in the navigation drawer to the roles above. */
    nav?: { label: string; icon: string }
  }

  interface TypesConfig {
    RouteNamedMap: {
      [Name in RouteName]: Name extends keyof RouteParamsByName
        ? RouteRecordInfo<Name, string, RouteParamsByName[Name], RouteParamsByName[Name]>
        : RouteRecordInfo<Name, string, RouteParamsRawGeneric, RouteParamsGeneric>
    }
  }
}

const roleHomes: Record<Role, RouteName> = {
  listener: 'my-cases',
  advisor: 'queue',
  supervisor: 'dashboard',
}

/** Where a role lands after sign-in and on '/'; signed-out visitors land on sign-in. */
export function homeRouteFor(role: Role | null | undefined): RouteName {
  return role ? roleHomes[role] : 'sign-in'
}

/**
 * The location of a route whose name is held in a variable. Literal names need no helper
 * (`{ name: 'queue' }`); a `RouteName`-typed variable goes through here because the typed router
 * checks one literal name at a time.
 */
export function named(name: RouteName, query?: LocationQueryRaw): RouteLocationRaw {
  return (query ? { name, query } : { name }) as RouteLocationRaw
}

type NamedRoute = RouteRecordRaw & { name: RouteName }

/** A page whose first screen draws a chart: the charts' chunk is fetched beside the page's, not after it mounts. */
function withCharts<T>(page: () => Promise<T>): () => Promise<T> {
  return () => {
    void import('../plugins/chart').then((c) => c.loadCharts()).catch(() => {})
    return page()
  }
}

/** '/' renders nothing: the guard in ./index.ts sends each visitor on to their role's home. */
export function buildRoutes(): NamedRoute[] {
  return [
    { path: '/', name: 'home', children: [] },
    {
      path: '/sign-in',
      name: 'sign-in',
      component: () => import('../pages/SignInPage.vue'),
      meta: { title: 'Sign in', public: true, guestOnly: true },
    },
    {
      path: '/sign-up',
      name: 'sign-up',
      component: () => import('../pages/SignUpPage.vue'),
      meta: { title: 'Create an account', public: true, guestOnly: true },
    },
    {
      path: '/cases',
      name: 'my-cases',
      component: () => import('../pages/ListenerHomePage.vue'),
      meta: { title: 'My cases', roles: ['listener'], nav: { label: 'My cases', icon: mdiFolderOutline } },
    },
    {
      path: '/cases/new',
      name: 'case-new',
      component: () => import('../pages/CaseNewPage.vue'),
      meta: { title: 'Open a case', roles: ['listener'] },
    },
    {
      path: '/cases/:id',
      name: 'case',
      component: withCharts(() => import('../pages/CasePage.vue')),
      meta: { title: 'Case', roles: ['listener'] },
    },
    {
      path: '/rooms',
      name: 'rooms',
      component: () => import('../pages/RoomsPage.vue'),
      meta: { title: 'My rooms', roles: ['listener'], nav: { label: 'My rooms', icon: mdiFloorPlan } },
    },
    {
      path: '/rooms/new',
      name: 'room-new',
      component: () => import('../pages/RoomEditorPage.vue'),
      meta: { title: 'Describe a room', roles: ['listener'] },
    },
    {
      path: '/rooms/:id',
      name: 'room-edit',
      component: () => import('../pages/RoomEditorPage.vue'),
      meta: { title: 'Room', roles: ['listener'] },
    },
    {
      path: '/dashboard',
      name: 'dashboard',
      component: withCharts(() => import('../pages/DashboardPage.vue')),
      meta: { title: 'Dashboard', roles: ['supervisor'], nav: { label: 'Dashboard', icon: mdiChartBoxOutline } },
    },
    {
      path: '/queue',
      name: 'queue',
      component: () => import('../pages/QueuePage.vue'),
      meta: { title: 'Case queue', roles: ['advisor', 'supervisor'], nav: { label: 'Case queue', icon: mdiTrayFull } },
    },
    {
      path: '/desk/cases/:id',
      name: 'case-workspace',
      component: withCharts(() => import('../pages/CaseWorkspacePage.vue')),
      meta: { title: 'Case', roles: ['advisor', 'supervisor'] },
    },
    {
      path: '/desk/cases/:id/plan',
      name: 'plan-editor',
      component: () => import('../pages/PlanEditorPage.vue'),
      meta: { title: 'Treatment plan', roles: ['advisor', 'supervisor'] },
    },
    {
      path: '/cases/:id/plans/:version/report',
      name: 'plan-report',
      component: () => import('../pages/PlanReportPage.vue'),
      meta: { title: 'Treatment plan', roles: ['listener', 'advisor', 'supervisor'] },
    },
    {
      path: '/team',
      name: 'team',
      component: () => import('../pages/TeamPage.vue'),
      meta: { title: 'Team', roles: ['supervisor'], nav: { label: 'Team', icon: mdiAccountGroupOutline } },
    },
    {
      path: '/team/audit',
      name: 'audit-log',
      component: () => import('../pages/AuditLogPage.vue'),
      meta: { title: 'Audit log', roles: ['supervisor'] },
    },
    {
      // The link in an invitation e-mail (server/services/team.ts setPasswordUrl).
      path: '/welcome/:token',
      name: 'set-password',
      component: () => import('../pages/SetPasswordPage.vue'),
      meta: { title: 'Set your password', public: true },
    },
    {
      path: '/forgot-password',
      name: 'forgot-password',
      component: () => import('../pages/ForgotPasswordPage.vue'),
      meta: { title: 'Forgot password', public: true },
    },
    {
      // The link in a password-reset e-mail (server/services/passwords.ts resetPasswordUrl); the token is in the #fragment.
      path: '/reset-password',
      name: 'reset-password',
      component: () => import('../pages/ResetPasswordPage.vue'),
      meta: { title: 'Choose a new password', public: true },
    },
    {
      path: '/guide/measuring',
      name: 'measuring-guide',
      component: () => import('../pages/MeasuringGuidePage.vue'),
      meta: {
        title: 'Measuring at home',
        roles: ['listener', 'advisor', 'supervisor'],
        nav: { label: 'Measuring guide', icon: mdiMicrophoneOutline },
      },
    },
    {
      path: '/account',
      name: 'account',
      component: () => import('../pages/AccountPage.vue'),
      meta: { title: 'Your account', roles: ['listener', 'advisor', 'supervisor'] },
    },
    {
      path: '/mailbox',
      name: 'mailbox',
      component: () => import('../pages/MailboxPage.vue'),
      meta: { title: 'Outgoing mail', roles: ['supervisor'], nav: { label: 'Outgoing mail', icon: mdiEmailOutline } },
    },
    {
      path: '/:pathMatch(.*)*',
      name: 'not-found',
      component: () => import('../pages/NotFoundPage.vue'),
      meta: { title: 'Page not found', public: true },
    },
  ]
}

/** Routes a role may open from the drawer, in drawer order. */
export function navigationFor(routes: readonly NamedRoute[], role: Role): { name: RouteName; label: string; icon: string }[] {
  return routes.flatMap((route) =>
    route.meta?.nav && route.meta.roles?.includes(role) ? [{ name: route.name, ...route.meta.nav }] : [],
  )
}

/** A `redirect` query value that is safe to follow: a path on this site, never another origin. */
export function safeRedirect(value: unknown): string | null {
  if (typeof value !== 'string' || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null
  return value
}
