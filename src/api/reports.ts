import { api, download } from './client';
import type { Status } from './compliance';

export type ReportStatus = 'draft' | 'certified' | 'revised';
export interface ReportChange { kind: 'limit_value' | 'limit_status' | 'daily_value'; key: string; before: unknown; after: unknown }
export interface ReportListItem {
  id: number;
  facilityId: number;
  facilityName: string | null;
  month: string;
  revision: number;
  status: ReportStatus;
  previousId: number | null;
  revisionReason: string | null;
  changes: ReportChange[] | null;
  certifiedAt: string | null;
  pdfSha256: string | null;
  createdAt: string;
}
export interface ReportLimit {
  limitId: number;
  permitNumber: string;
  pointCode: string | null;
  parameter: string;
  statistic: string;
  bound: 'minimum' | 'maximum';
  limitValue: string;
  units: string;
  value: string | null;
  reported: string | null;
  sampleCount: number;
  status: Status;
}
export interface ReportContent {
  facility: { id: number; name: string };
  month: string;
  revision: number;
  status: ReportStatus;
  permits: { id: number; number: string }[];
  limits: ReportLimit[];
  exceedances: { id: number; pointCode: string | null; parameter: string; statistic: string; bound: string; periodStart: string; periodEnd: string; reported: string; limitValue: string; units: string; status: string; correctiveAction: string | null; closedReason: string | null }[];
  daily: { pointId: number; pointCode: string | null; parameter: string; units: string; limitValue: number | null; values: { sampledAt: string; value: number; resultId: number }[] }[];
  qc: { results: number; standardizations: number; calibrations: number; calibrationsFailed: number; qcBatches: number; qcBatchesFailed: number; duplicates: number; checkStandards: number; blanks: number; qualifiers: Record<string, number> };
  certification: { wording: string; statement: string | null; signedBy: string | null; signedAt: string | null; ip: string | null };
}
export interface ReportDto extends ReportListItem {
  content: ReportContent;
  versions: { id: number; revision: number; status: ReportStatus; pdfSha256: string | null; certifiedAt: string | null }[];
}
export interface BatchItem { facilityId: number; month: string; state: 'pending' | 'made' | 'existing' | 'failed'; reportId: number | null; error: string | null }
export interface BatchDto { id: number; year: number; status: 'running' | 'paused' | 'finished'; total: number; done: number; failed: number; items: BatchItem[]; createdAt: string; finishedAt: string | null }

export const reportsApi = {
  list: (q: { facilityId?: number | null; status?: string | null; year?: string | null }) => api.get<{ items: ReportListItem[]; total: number }>('/reports', q),
  create: (facilityId: number, month: string) => api.post<ReportListItem>('/reports', { facilityId, month }),
  get: (id: number) => api.get<ReportDto>(`/reports/${id}`),
  certify: (id: number, password: string, statement: string) => api.post<ReportDto>(`/reports/${id}/certify`, { password, statement }),
  pendingChanges: (id: number) => api.get<{ changes: ReportChange[] }>(`/reports/${id}/pending-changes`),
  revise: (id: number, reason: string) => api.post<ReportListItem>(`/reports/${id}/revisions`, { reason }),
  pdf: (r: { id: number; facilityId: number; month: string; revision: number }) => download(`/reports/${r.id}/pdf`, `report-${r.facilityId}-${r.month}-r${r.revision}.pdf`),
  csv: (r: { id: number; facilityId: number; month: string; revision: number }) => download(`/reports/${r.id}/csv`, `report-${r.facilityId}-${r.month}-r${r.revision}.csv`),
  batches: () => api.get<{ items: BatchDto[] }>('/report-batches'),
  batch: (id: number) => api.get<BatchDto>(`/report-batches/${id}`),
  createBatch: (facilityIds: number[], year: number) => api.post<BatchDto>('/report-batches', { facilityIds, year }),
  batchState: (id: number, action: 'pause' | 'resume') => api.post<BatchDto>(`/report-batches/${id}/state`, { action }),
};
