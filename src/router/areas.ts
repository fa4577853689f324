import type { RouteRecordRaw } from 'vue-router';
import type { Capability } from '@shared/roles';

/**
 * The menu is data: each area of product.md that exists, its route, icon and the
 * capability needed to see it. The router guard and the menu both read this list.
 */
export interface Area {
  key: string;
  label: string;
  icon: string;
  path: string;
  capability?: Capability;
  routes: RouteRecordRaw[];
}

export const areas: Area[] = [
  {
    key: 'today',
    label: 'Today',
    icon: 'pi pi-sun',
    path: '/today',
    routes: [{ path: '/today', name: 'today', component: () => import('@/views/today/TodayView.vue') }],
  },
];
