import type { Page } from '@shared/schemas/common';
import { api } from './client';

export interface OrganizationDto {
  id: number;
  name: string;
  kind: 'laboratory' | 'utility';
  labId: number | null;
  contactEmail: string | null;
  billingEmail: string | null;
  address: string | null;
  active: boolean;
}
export interface FacilityDto {
  id: number;
  organizationId: number;
  organizationName: string | null;
  name: string;
  kind: 'drinking_water' | 'wastewater' | 'industrial';
  address: string | null;
  timezone: string;
  active: boolean;
}
export interface PointDto {
  id: number;
  facilityId: number;
  facilityName: string | null;
  code: string;
  name: string;
  matrix: string;
  active: boolean;
}

type Q = Record<string, unknown>;
const q = (query: Q) => query as Record<string, string | number | boolean | undefined>;

export const sitesApi = {
  organizations: (query: Q) => api.get<Page<OrganizationDto>>('/organizations', q(query)),
  createOrganization: (body: object) => api.post<OrganizationDto>('/organizations', body),
  updateOrganization: (id: number, body: object) => api.patch<OrganizationDto>(`/organizations/${id}`, body),
  facilities: (query: Q) => api.get<Page<FacilityDto>>('/facilities', q(query)),
  facility: (id: number) => api.get<FacilityDto>(`/facilities/${id}`),
  createFacility: (body: object) => api.post<FacilityDto>('/facilities', body),
  updateFacility: (id: number, body: object) => api.patch<FacilityDto>(`/facilities/${id}`, body),
  points: (facilityId: number, query: Q) => api.get<Page<PointDto>>(`/facilities/${facilityId}/points`, q(query)),
  createPoint: (facilityId: number, body: object) => api.post<PointDto>(`/facilities/${facilityId}/points`, body),
  updatePoint: (id: number, body: object) => api.patch<PointDto>(`/points/${id}`, body),
};
