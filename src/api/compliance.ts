import type { Page } from '@shared/schemas/common';
import { api } from './client';

export type Status = 'within' | 'near' | 'exceeded' | 'no_data';

export interface LimitSummaryDto {
  limitId: number;
  permitId: number;
  permitNumber: string;
  pointId: number;
  pointCode: string | null;
  pointName: string | null;
  parameter: string;
  statistic: string;
  bound: 'minimum' | 'maximum';
  limitValue: string;
  units: string;
  value: string | null;
  reported: string | null;
  sampleCount: number;
  status: Status;
  exceedanceCount: number;
  rows: { periodStart: string; periodEnd: string; value: string | null; reported: string | null; sampleCount: number; status: Status }[];
}
export interface NoticeDelivery {
  status: 'pending' | 'sending' | 'sent' | 'failed';
  attempts: number;
  sentAt: string | null;
  lastError: string | null;
}
export interface ExceedanceDto {
  id: number;
  facilityId: number;
  facilityName: string | null;
  permitNumber: string | null;
  pointCode: string | null;
  parameter: string;
  statistic: string;
  bound: string;
  periodStart: string;
  periodEnd: string;
  value: string;
  reported: string;
  limitValue: string;
  units: string;
  resultIds: number[];
  status: 'open' | 'notified' | 'acknowledged' | 'closed';
  correctiveAction: string | null;
  closedReason: string | null;
  detectedAt: string;
  notices: { id: number; kind: string; subject: string; recipients: string[]; createdAt: string; delivery: NoticeDelivery | null }[];
}
export interface ProjectionDto {
  limitId: number;
  pointCode: string | null;
  sentence: string;
  crossesLimit: boolean;
  periodStart: string;
  periodEnd: string;
}
export interface ComplianceMonthDto {
  facility: { id: number; name: string; timezone: string };
  month: string;
  permits: { id: number; number: string }[];
  limits: LimitSummaryDto[];
  projections: ProjectionDto[];
  exceedances: ExceedanceDto[];
  series: Record<string, { sampledAt: string; value: number; resultId: number }[]>;
}

export const complianceApi = {
  month: (facilityId: number, month: string) => api.get<ComplianceMonthDto>('/compliance', { facilityId, month }),
  exceedances: (query: Record<string, unknown>) => api.get<Page<ExceedanceDto>>('/exceedances', query as Record<string, string>),
  exceedance: (id: number) => api.get<ExceedanceDto>(`/exceedances/${id}`),
  acknowledge: (id: number, correctiveAction: string) => api.post<ExceedanceDto>(`/exceedances/${id}/acknowledge`, { correctiveAction }),
  close: (id: number, reason: string) => api.post<ExceedanceDto>(`/exceedances/${id}/close`, { reason }),
  alerts: () => api.get<Page<{ id: number; facilityId: number }>>('/projection-alerts'),
  subscribe: (facilityId: number) => api.post<{ id: number; facilityId: number }>('/projection-alerts', { facilityId }),
  unsubscribe: (id: number) => api.del<{ id: number }>(`/projection-alerts/${id}`),
  publicNotice: (token: string) => api.get<{ kind: string; subject: string; body: string; sentAt: string; expiresAt: string; exceedance: Record<string, string | null> }>(`/public/notices/${encodeURIComponent(token)}`),
};
