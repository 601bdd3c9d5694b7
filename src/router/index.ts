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
