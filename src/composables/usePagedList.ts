import { reactive, ref, shallowRef, watch } from 'vue';
import type { DataTablePageEvent, DataTableSortEvent } from 'primevue/datatable';
import type { Page } from '@shared/schemas/common';
import { ApiError } from '@/api/client';

/**
 * Server-side paging, sorting and filtering for a PrimeVue DataTable in lazy mode.
 * `fetcher` gets `{page, pageSize, sort, ...filters}`; filters reload from page 1.
 */
export function usePagedList<T, F extends Record<string, unknown>>(
  fetcher: (query: Record<string, unknown>) => Promise<Page<T>>,
  initialFilters: F,
  opts: { pageSize?: number; sort?: string } = {},
) {
  const items = shallowRef<T[]>([]);
  const total = ref(0);
  const loading = ref(false);
  const error = ref<string | null>(null);
  const filters = reactive({ ...initialFilters }) as F;
  const state = reactive({ page: 1, pageSize: opts.pageSize ?? 25, sort: opts.sort as string | undefined });

  async function load() {
    loading.value = true;
    error.value = null;
    try {
      const res = await fetcher({ ...filters, page: state.page, pageSize: state.pageSize, sort: state.sort });
      items.value = res.items;
      total.value = res.total;
    } catch (e) {
      error.value = e instanceof ApiError ? e.message : 'The list could not be loaded.';
    } finally {
      loading.value = false;
    }
  }

  function onPage(e: DataTablePageEvent) {
    state.page = e.page + 1;
    state.pageSize = e.rows;
    load();
  }
  function onSort(e: DataTableSortEvent) {
    const field = typeof e.sortField === 'string' ? e.sortField : undefined;
    state.sort = field ? `${e.sortOrder === -1 ? '-' : ''}${field}` : opts.sort;
    state.page = 1;
    load();
  }

  let timer: ReturnType<typeof setTimeout> | undefined;
  watch(
    () => ({ ...filters }),
    () => {
      clearTimeout(timer);
      timer = setTimeout(() => {
        state.page = 1;
        load();
      }, 250);
    },
    { deep: true },
  );

  return { items, total, loading, error, filters, state, load, onPage, onSort, first: () => (state.page - 1) * state.pageSize };
}
