import type { Page } from '@shared/schemas/common';
import type { BenchSettings } from '@shared/schemas/bench';
import type { CalibrationView, QcBatchView, ReviewItem, SampleView, StandardizationView, TitrantView, TitrationDetail, TitrationView } from '@shared/types/bench';
import { api } from './client';

export interface AuditEntry {
  id: number;
  createdAt: string;
  action: string;
  titrationId: number;
  actor: { id: number; name: string; email: string } | null;
  before: unknown;
  after: unknown;
  reason?: string | null;
}

type Q = Record<string, unknown>;
const q = (query: Q) => query as Record<string, string | number | boolean | undefined>;

/** Samples, titrations and their workflow, the review queue, and the titrant lots they use. */
export const benchApi = {
  samples: (query: Q) => api.get<Page<SampleView>>('/samples', q(query)),
  sample: (id: number) => api.get<SampleView>(`/samples/${id}`),
  createSample: (body: object) => api.post<SampleView>('/samples', body),
  updateSample: (id: number, body: object) => api.patch<SampleView>(`/samples/${id}`, body),

  /** A daily-grid row: sample + titration (+ submit), all or nothing. */
  createEntry: (body: object) => api.post<{ sample: SampleView; titration: TitrationView }>('/bench/entries', body),
  createTitration: (sampleId: number, body: object) => api.post<TitrationView>(`/samples/${sampleId}/titrations`, body),
  titration: (id: number) => api.get<TitrationDetail>(`/titrations/${id}`),
  updateTitration: (id: number, body: object) => api.patch<TitrationView>(`/titrations/${id}`, body),
  submit: (id: number, version: number) => api.post<TitrationView>(`/titrations/${id}/submit`, { version }),
  approve: (id: number, version: number) => api.post<TitrationView>(`/titrations/${id}/approve`, { version }),
  returnTitration: (id: number, version: number, comment: string) => api.post<TitrationView>(`/titrations/${id}/return`, { version, comment }),
  amend: (id: number, body: object) => api.post<TitrationView>(`/titrations/${id}/amend`, body),
  uploadReadings: (id: number, file: File, version: number) => {
    const form = new FormData();
    form.append('version', String(version));
    form.append('file', file);
    return api.upload<TitrationView>(`/titrations/${id}/readings`, form);
  },
  audit: (id: number) => api.get<Page<AuditEntry>>(`/titrations/${id}/audit`, { pageSize: 200 }),

  review: (query: Q) => api.get<Page<ReviewItem>>('/review', q(query)),
  bulkApprove: (items: { id: number; version: number }[]) => api.post<{ approved: number[]; items: TitrationView[] }>('/review/approve', { items }),

  titrants: (query: Q) => api.get<Page<TitrantView>>('/titrants', q(query)),
  titrant: (id: number) => api.get<TitrantView>(`/titrants/${id}`),
  createTitrant: (body: object) => api.post<TitrantView>('/titrants', body),
  updateTitrant: (id: number, body: object) => api.patch<TitrantView>(`/titrants/${id}`, body),
  standardizations: (titrantId: number, query: Q = {}) => api.get<Page<StandardizationView>>(`/titrants/${titrantId}/standardizations`, q(query)),
  createStandardization: (titrantId: number, body: object) => api.post<StandardizationView>(`/titrants/${titrantId}/standardizations`, body),

  calibrations: (query: Q) => api.get<Page<CalibrationView>>('/calibrations', q(query)),
  createCalibration: (body: object) => api.post<CalibrationView>('/calibrations', body),

  qcBatches: (query: Q) => api.get<Page<QcBatchView>>('/qc-batches', q(query)),
  qcBatch: (id: number) => api.get<QcBatchView>(`/qc-batches/${id}`),
  createQcBatch: (body: object) => api.post<QcBatchView>('/qc-batches', body),

  benchSettings: () => api.get<{ settings: BenchSettings; defaults: BenchSettings; overrides: Partial<BenchSettings> }>('/lab-settings/bench'),
};
