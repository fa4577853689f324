import type { ToolInputs } from '@shared/types/tools';
import { api } from './client';

/** The Tools pages' server look-ups (their calculations run in the browser). */
export const toolsApi = {
  /** A point's latest approved figures, each with the result it came from. */
  latestInputs: (pointId: number) => api.get<ToolInputs>('/tools/inputs', { pointId }),
};
