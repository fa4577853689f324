import { api } from './client';

export interface Health {
  status: 'ok' | 'degraded';
  db: 'up' | 'down';
}

export const getHealth = () => api.get<Health>('/health');
