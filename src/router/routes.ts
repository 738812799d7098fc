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
type Page = () => Promise<unknown>

const LISTENER: Role[] = ['listener']
const STAFF: Role[] = ['advisor', 'supervisor']
const SUPERVISOR: Role[] = ['supervisor']
const EVERYONE: Role[] = ['listener', 'advisor', 'supervisor']
/** Open to signed-out visitors only (sign-in, sign-up): a signed-in user goes to their home. */
const GUEST = { public: true, guestOnly: true } as const
const PUBLIC = { public: true } as const

/** One route: its address, name, lazily loaded page and meta (title, who may open it, its drawer entry). */
const page = (path: string, name: RouteName, component: Page, meta: RouteRecordRaw['meta']): NamedRoute =>
  ({ path, name, component, meta }) as NamedRoute

/** A page whose first screen draws a chart: the charts' chunk is fetched beside the page's, not after it mounts. */
const withCharts = (load: Page): Page => () => {
  void import('../plugins/chart').then((c) => c.loadCharts()).catch(() => {})
  return load()
}

/** '/' renders nothing: the guard in ./index.ts sends each visitor on to their role's home. */
export function buildRoutes(): NamedRoute[] {
  return [
    { path: '/', name: 'home', children: [] },
    page('/sign-in', 'sign-in', () => import('../pages/SignInPage.vue'), { title: 'Sign in', ...GUEST }),
    page('/sign-up', 'sign-up', () => import('../pages/SignUpPage.vue'), { title: 'Create an account', ...GUEST }),
    page('/cases', 'my-cases', () => import('../pages/ListenerHomePage.vue'), { title: 'My cases', roles: LISTENER, nav: { label: 'My cases', icon: mdiFolderOutline } }),
    page('/cases/new', 'case-new', () => import('../pages/CaseNewPage.vue'), { title: 'Open a case', roles: LISTENER }),
    page('/cases/:id', 'case', withCharts(() => import('../pages/CasePage.vue')), { title: 'Case', roles: LISTENER }),
    page('/rooms', 'rooms', () => import('../pages/RoomsPage.vue'), { title: 'My rooms', roles: LISTENER, nav: { label: 'My rooms', icon: mdiFloorPlan } }),
    page('/rooms/new', 'room-new', () => import('../pages/RoomEditorPage.vue'), { title: 'Describe a room', roles: LISTENER }),
    page('/rooms/:id', 'room-edit', () => import('../pages/RoomEditorPage.vue'), { title: 'Room', roles: LISTENER }),
    page('/dashboard', 'dashboard', withCharts(() => import('../pages/DashboardPage.vue')), { title: 'Dashboard', roles: SUPERVISOR, nav: { label: 'Dashboard', icon: mdiChartBoxOutline } }),
    page('/queue', 'queue', () => import('../pages/QueuePage.vue'), { title: 'Case queue', roles: STAFF, nav: { label: 'Case queue', icon: mdiTrayFull } }),
    page('/desk/cases/:id', 'case-workspace', withCharts(() => import('../pages/CaseWorkspacePage.vue')), { title: 'Case', roles: STAFF }),
    page('/desk/cases/:id/plan', 'plan-editor', () => import('../pages/PlanEditorPage.vue'), { title: 'Treatment plan', roles: STAFF }),
    page('/cases/:id/plans/:version/report', 'plan-report', () => import('../pages/PlanReportPage.vue'), { title: 'Treatment plan', roles: EVERYONE }),
    page('/team', 'team', () => import('../pages/TeamPage.vue'), { title: 'Team', roles: SUPERVISOR, nav: { label: 'Team', icon: mdiAccountGroupOutline } }),
    page('/team/audit', 'audit-log', () => import('../pages/AuditLogPage.vue'), { title: 'Audit log', roles: SUPERVISOR }),
    // The link in an invitation e-mail (server/services/team.ts setPasswordUrl).
    page('/welcome/:token', 'set-password', () => import('../pages/SetPasswordPage.vue'), { title: 'Set your password', ...PUBLIC }),
    page('/forgot-password', 'forgot-password', () => import('../pages/ForgotPasswordPage.vue'), { title: 'Forgot password', ...PUBLIC }),
    // The link in a password-reset e-mail (server/services/passwords.ts resetPasswordUrl); the token is in the #fragment.
    page('/reset-password', 'reset-password', () => import('../pages/ResetPasswordPage.vue'), { title: 'Choose a new password', ...PUBLIC }),
    page('/guide/measuring', 'measuring-guide', () => import('../pages/MeasuringGuidePage.vue'), {
      title: 'Measuring at home', roles: EVERYONE, nav: { label: 'Measuring guide', icon: mdiMicrophoneOutline },
    }),
    page('/account', 'account', () => import('../pages/AccountPage.vue'), { title: 'Your account', roles: EVERYONE }),
    page('/mailbox', 'mailbox', () => import('../pages/MailboxPage.vue'), { title: 'Outgoing mail', roles: SUPERVISOR, nav: { label: 'Outgoing mail', icon: mdiEmailOutline } }),
    page('/:pathMatch(.*)*', 'not-found', () => import('../pages/NotFoundPage.vue'), { title: 'Page not found', ...PUBLIC }),
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
  // The URL parser drops tabs and line breaks and reads `\` as `/`, so `/\t/evil.example` is `//evil.example`:
  // any control character or backslash is refused, and what is left must resolve to this origin.
  if (typeof value !== 'string' || !value.startsWith('/') || /[\u0000-\u001f\u007f\\]/.test(value)) return null
  const base = 'https://same-origin.invalid'
  let url: URL
  try {
    url = new URL(value, base)
  } catch {
    return null
  }
  if (url.origin !== base || value.startsWith('//')) return null
  return value
}
