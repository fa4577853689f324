import type { Page } from '@shared/schemas/common';
import type { Role } from '@shared/roles';
import { api } from './client';

export interface UserDto {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  organizationId: number;
  organizationName: string | null;
  mustChangePassword: boolean;
  lastLoginAt: string | null;
}
export interface AuditEventDto {
  id: string;
  createdAt: string;
  action: string;
  entity: string;
  entityId: string | null;
  organizationId: number | null;
  actor: { id: number; name: string; email: string } | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  reason: string | null;
  ip: string | null;
}

type Q = Record<string, unknown>;
const q = (query: Q) => query as Record<string, string | number | boolean | undefined>;

export const adminApi = {
  users: (query: Q) => api.get<Page<UserDto>>('/users', q(query)),
  createUser: (body: object) => api.post<{ user: UserDto; temporaryPassword: string }>('/users', body),
  updateUser: (id: number, body: object) => api.patch<UserDto>(`/users/${id}`, body),
  resetPassword: (id: number) => api.post<{ temporaryPassword: string }>(`/users/${id}/reset-password`),
  auditEvents: (query: Q) => api.get<Page<AuditEventDto>>('/audit-events', q(query)),
  changePassword: (body: object) => api.post<{ token: string }>('/auth/password', body),
};
