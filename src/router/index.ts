import { createRouter, createWebHistory } from 'vue-router';
import AppShell from '@/layout/AppShell.vue';
import { areas } from './areas';

export const router = createRouter({
  history: createWebHistory(),
  routes: [
    {
      path: '/',
      component: AppShell,
      children: [
        { path: '', redirect: '/today' },
        ...areas.flatMap((a) => a.routes.map((r) => ({ ...r, meta: { ...(r.meta ?? {}), area: a.key, capability: a.capability } }))),
        { path: ':pathMatch(.*)*', name: 'not-found', component: () => import('@/views/common/NotFoundView.vue') },
      ],
    },
  ],
});
