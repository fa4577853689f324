import { ref, shallowRef } from 'vue';
import { ApiError } from '@/api/client';

/** Loading, error and data of one async call; `run` may be called again to reload. */
export function useAsync<T, A extends unknown[]>(fn: (...args: A) => Promise<T>) {
  const data = shallowRef<T | null>(null);
  const loading = ref(false);
  const error = ref<string | null>(null);
  async function run(...args: A): Promise<T | null> {
    loading.value = true;
    error.value = null;
    try {
      data.value = await fn(...args);
      return data.value;
    } catch (e) {
      error.value = e instanceof ApiError ? e.message : 'Something went wrong.';
      return null;
    } finally {
      loading.value = false;
    }
  }
  return { data, loading, error, run };
}
