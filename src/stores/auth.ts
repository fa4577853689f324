import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { LoginResponse, SessionUser } from '@shared/types/auth';
import { api, setToken, setUnauthenticatedHandler } from '@/api/client';

const KEY = 'titrata.session';

/**
 * The signed-in user and the bearer token. The token travels in the Authorization
 * header only (no cookie), so a forged cross-site request carries no credentials.
 */
export const useAuthStore = defineStore('auth', () => {
  const user = ref<SessionUser | null>(null);
  const token = ref<string | null>(null);
  const role = computed(() => user.value?.role ?? null);
  const ready = ref(false);

  function persist() {
    if (token.value) localStorage.setItem(KEY, token.value);
    else localStorage.removeItem(KEY);
    setToken(token.value);
  }

  async function restore() {
    if (ready.value) return;
    const saved = localStorage.getItem(KEY);
    if (saved) {
      token.value = saved;
      setToken(saved);
      try {
        user.value = await api.get<SessionUser>('/auth/me');
      } catch {
        token.value = null;
        user.value = null;
        persist();
      }
    }
    ready.value = true;
  }

  async function signIn(email: string, password: string) {
    const res = await api.post<LoginResponse>('/auth/login', { email, password });
    token.value = res.token;
    user.value = res.user;
    persist();
    return res.user;
  }

  function signOut() {
    token.value = null;
    user.value = null;
    persist();
    window.location.assign('/sign-in');
  }

  setUnauthenticatedHandler(() => {
    token.value = null;
    user.value = null;
    persist();
    if (!window.location.pathname.startsWith('/sign-in')) window.location.assign('/sign-in?expired=1');
  });

  return { user, token, role, ready, restore, signIn, signOut };
});
