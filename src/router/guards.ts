import type { Router } from 'vue-router';
import { can, type Capability } from '@shared/roles';
import { useAuthStore } from '@/stores/auth';

/** Signed in? Role allowed? Both read shared/roles.ts, like the server. */
export function installGuards(router: Router) {
  router.beforeEach(async (to) => {
    const auth = useAuthStore();
    await auth.restore();
    if (to.meta.public) return true;
    if (!auth.user) return { name: 'sign-in', query: to.fullPath !== '/' && to.fullPath !== '/today' ? { next: to.fullPath } : {} };
    if (auth.user.mustChangePassword && to.name !== 'change-password') return { name: 'change-password' };
    const capability = to.meta.capability as Capability | undefined;
    if (capability && !can(auth.role, capability)) return { path: '/today', query: { denied: to.path } };
    return true;
  });
}
