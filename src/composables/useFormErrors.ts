import { ref } from 'vue';
import { useToast } from 'primevue/usetoast';
import type { z } from 'zod';
import { InputError } from '@shared/errors';
import { parseOrThrow } from '@shared/schemas/parse';
import { ApiError } from '@/api/client';

/**
 * Field errors for a form: the shared zod schema checks before sending, the server's
 * `fields` are shown beside the same inputs, anything else goes to one toast.
 */
export function useFormErrors() {
  const errors = ref<Record<string, string>>({});
  const toast = useToast();

  function check<S extends z.ZodType>(schema: S, value: unknown): z.output<S> | null {
    try {
      errors.value = {};
      return parseOrThrow(schema, value);
    } catch (e) {
      if (e instanceof InputError) errors.value = e.fields;
      return null;
    }
  }

  function handle(e: unknown, summary = 'Not saved') {
    if (e instanceof ApiError && Object.keys(e.fields).length) {
      errors.value = e.fields;
      toast.add({ severity: 'warn', summary, detail: e.message, life: 5000 });
    } else {
      toast.add({ severity: 'error', summary, detail: e instanceof Error ? e.message : String(e), life: 7000 });
    }
  }

  return { errors, check, handle, clear: () => (errors.value = {}) };
}
