import type { Sequelize } from 'sequelize';
import { AuditEvent } from './AuditEvent.js';
import { Facility } from './Facility.js';
import { MonitoringPoint } from './MonitoringPoint.js';
import { Organization } from './Organization.js';
import { User } from './User.js';
import { associate } from './associations.js';

export { AuditEvent, Facility, MonitoringPoint, Organization, User };

const initialised = new WeakSet<Sequelize>();

/** Binds every model to `sequelize` (once per instance) and wires the associations. */
export function initModels(sequelize: Sequelize) {
  if (initialised.has(sequelize)) return;
  for (const m of [Organization, User, Facility, MonitoringPoint, AuditEvent]) m.initModel(sequelize);
  associate();
  initialised.add(sequelize);
}
