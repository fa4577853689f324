import { createRouter, createWebHistory } from 'vue-router';
import AppShell from '@/layout/AppShell.vue';
import { areas } from './areas';
import { installGuards } from './guards';

export const router = createRouter({
  history: createWebHistory(),
  routes: [
    { path: '/sign-in', name: 'sign-in', component: () => import('@/views/auth/SignInView.vue'), meta: { public: true } },
    { path: '/public/notices/:token', name: 'public-notice', component: () => import('@/views/public/PublicNoticeView.vue'), props: true, meta: { public: true } },
    {
      path: '/',
      component: AppShell,
      children: [
        { path: '', redirect: '/today' },
        ...areas.flatMap((a) => a.routes.map((r) => ({ ...r, meta: { ...(r.meta ?? {}), area: a.key, capability: r.meta?.capability ?? a.capability } }))),
        { path: 'account/password', name: 'change-password', component: () => import('@/views/auth/ChangePasswordView.vue') },
        { path: ':pathMatch(.*)*', name: 'not-found', component: () => import('@/views/common/NotFoundView.vue'), meta: { public: true } },
      ],
    },
  ],
  scrollBehavior: () => ({ top: 0 }),
});

installGuards(router);
