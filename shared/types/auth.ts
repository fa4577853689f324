import type { Role } from '../roles.js';

export type OrganizationKind = 'laboratory' | 'utility';

export interface OrganizationRef {
  id: number;
  name: string;
  kind: OrganizationKind;
}

/** The signed-in user as `/auth/login` and `/auth/me` return it. */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  organization: OrganizationRef;
  mustChangePassword: boolean;
}

export interface LoginResponse {
  token: string;
  expiresAt: string;
  user: SessionUser;
}
