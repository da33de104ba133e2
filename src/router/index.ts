import { createRouter, createWebHistory, type RouteRecordRaw } from 'vue-router'
import { onUnauthorized } from '@/api/http.ts'
import { useSessionStore } from '@/stores/session.ts'

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean
  }
}

export const routes: RouteRecordRaw[] = [
  { path: '/', redirect: '/stars' },
  { path: '/sign-in', name: 'sign-in', component: () => import('@/views/SignInView.vue'), meta: { public: true } },
  { path: '/register', name: 'register', component: () => import('@/views/RegisterView.vue'), meta: { public: true } },
  { path: '/reset-request', name: 'reset-request', component: () => import('@/views/ResetRequestView.vue'), meta: { public: true } },
  { path: '/reset', name: 'reset', component: () => import('@/views/ResetView.vue'), meta: { public: true } },
  { path: '/invite', name: 'invite', component: () => import('@/views/InviteView.vue'), meta: { public: true } },
  { path: '/team', name: 'team', component: () => import('@/views/TeamView.vue') },
  { path: '/stars', name: 'stars', component: () => import('@/views/StarListView.vue') },
  { path: '/survey', name: 'survey', component: () => import('@/views/SurveyView.vue') },
  { path: '/stars/:starId(\\d+)', name: 'star', component: () => import('@/views/StarView.vue'), props: (r) => ({ starId: Number(r.params.starId) }) },
  { path: '/stars/:starId(\\d+)/add-data', name: 'add-data', component: () => import('@/views/AddDataView.vue'), props: (r) => ({ starId: Number(r.params.starId) }) },
  { path: '/stars/:starId(\\d+)/analysis', name: 'analysis', component: () => import('@/views/AnalysisView.vue'), props: (r) => ({ starId: Number(r.params.starId) }) },
  { path: '/reports/:reportId(\\d+)', name: 'report', component: () => import('@/views/ReportView.vue'), props: (r) => ({ reportId: Number(r.params.reportId) }) },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { public: true } },
]

const router = createRouter({ history: createWebHistory(), routes })

/** Signed-out visitors of a protected page go to sign-in and come back afterwards. */
router.beforeEach(async (to) => {
  const session = useSessionStore()
  if (!session.checked) await session.load()
  if (!to.meta.public && !session.user) {
    return { name: 'sign-in', query: to.fullPath === '/' || to.fullPath === '/stars' ? {} : { next: to.fullPath } }
  }
  if (to.name === 'sign-in' && session.user) return { name: 'stars' }
  return true
})

/** A session that expires mid-work leads back to sign-in, and then to the same page. */
onUnauthorized(() => {
  const session = useSessionStore()
  session.me.data = null
  const here = router.currentRoute.value
  if (!here.meta.public) router.replace({ name: 'sign-in', query: { next: here.fullPath } })
})

export default router
