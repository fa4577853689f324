import type { Page } from '@shared/schemas/common';
import { api } from './client';

export interface LimitDto {
  id: number;
  permitId: number;
  pointId: number;
  pointCode: string | null;
  pointName: string | null;
  parameter: string;
  statistic: string;
  bound: 'minimum' | 'maximum';
  value: string;
  units: string;
  significantFigures: number | null;
  decimals: number | null;
  reportingLimit: string | null;
  belowReportingLimit: 'zero' | 'half' | 'limit';
  effectiveFrom: string;
  effectiveTo: string | null;
  active: boolean;
}
export interface PermitDto {
  id: number;
  facilityId: number;
  facilityName: string | null;
  organizationId: number;
  number: string;
  issuingAuthority: string;
  effectiveFrom: string;
  expiresOn: string | null;
  regulatorContacts: { name: string; email: string }[];
  followUpText: string | null;
  followUpDeadlineValue: number | null;
  followUpDeadlineUnit: 'hours' | 'days' | null;
  certificationWording: string | null;
  roundingMode: 'half_up' | 'half_even';
  weekStartsOn: number;
  weekMonthRule: 'week_end_month' | 'split';
  active: boolean;
  limits?: LimitDto[];
}

type Q = Record<string, unknown>;
export const permitsApi = {
  list: (query: Q) => api.get<Page<PermitDto>>('/permits', query as Record<string, string>),
  get: (id: number) => api.get<PermitDto & { limits: LimitDto[] }>(`/permits/${id}`),
  create: (body: object) => api.post<PermitDto>('/permits', body),
  update: (id: number, body: object) => api.patch<PermitDto>(`/permits/${id}`, body),
  createLimit: (permitId: number, body: object) => api.post<LimitDto>(`/permits/${permitId}/limits`, body),
  updateLimit: (id: number, body: object) => api.patch<LimitDto>(`/limits/${id}`, body),
};
