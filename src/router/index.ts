import { createRouter, createWebHistory } from 'vue-router'
import { useSessionStore } from '../stores/session'
import { decide } from './guard'

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable while signed out. */
    public?: boolean
    /** Only for signed-out visitors (sign-in, sign-up). */
    guestOnly?: boolean
    title?: string
  }
}

export const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes: [
    { path: '/', redirect: { name: 'rooms' } },
    {
      path: '/sign-in',
      name: 'sign-in',
      component: () => import('../views/SignInView.vue'),
      meta: { public: true, guestOnly: true, title: 'Sign in' },
    },
    {
      path: '/sign-up',
      name: 'sign-up',
      component: () => import('../views/SignUpView.vue'),
      meta: { public: true, guestOnly: true, title: 'Create an account' },
    },
    { path: '/rooms', name: 'rooms', component: () => import('../views/RoomsView.vue'), meta: { title: 'Rooms' } },
    {
      path: '/rooms/new',
      name: 'create-room',
      component: () => import('../views/CreateRoomView.vue'),
      meta: { title: 'New room' },
    },
    {
      path: '/rooms/:id',
      name: 'room',
      component: () => import('../views/RoomView.vue'),
      props: true,
      meta: { title: 'Room' },
    },
    {
      path: '/rooms/:id/compare',
      name: 'snapshot-compare',
      component: () => import('../views/SnapshotCompareView.vue'),
      props: true,
      meta: { title: 'Compare snapshots' },
    },
    {
      path: '/rooms/:id/report',
      name: 'room-report',
      component: () => import('../views/ReportView.vue'),
      props: true,
      meta: { title: 'Report' },
    },
    // Public: a signed-out guest previews the invite, then signs in or up and comes back here.
    {
      path: '/invite/:token',
      name: 'invite',
      component: () => import('../views/InviteView.vue'),
      props: true,
      meta: { public: true, title: 'Invite' },
    },
    // Signed in like its API: outside production the user's own mail from the fake SMTP server, in
    // production a "not available" note.
    {
      path: '/dev/mailbox',
      name: 'dev-mailbox',
      component: () => import('../views/MailboxView.vue'),
      meta: { title: 'Dev mailbox' },
    },
    {
      path: '/:missing(.*)*',
      name: 'not-found',
      component: () => import('../views/NotFoundView.vue'),
      meta: { public: true, title: 'Not found' },
    },
  ],
})

router.beforeEach(async (to) => {
  const session = useSessionStore()
  // An unreachable server counts as signed out here; the sign-in form then shows the real error.
  await session.load().catch(() => undefined)
  return decide(to, session.signedIn)
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Veilroom` : 'Veilroom'
})
