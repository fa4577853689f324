import type { Sequelize } from 'sequelize';
import { AuditEvent } from './AuditEvent.js';
import { Facility } from './Facility.js';
import { MonitoringPoint } from './MonitoringPoint.js';
import { Organization } from './Organization.js';
import { OutboxAttachment, OutboxMessage } from './OutboxMessage.js';
import { Permit } from './Permit.js';
import { PermitLimit } from './PermitLimit.js';
import { User } from './User.js';
import { associate } from './associations.js';

export { AuditEvent, Facility, MonitoringPoint, Organization, OutboxAttachment, OutboxMessage, Permit, PermitLimit, User };

const initialised = new WeakSet<Sequelize>();

/** Binds every model to `sequelize` (once per instance) and wires the associations. */
export function initModels(sequelize: Sequelize) {
  if (initialised.has(sequelize)) return;
  const models = [
    Organization,
    User,
    Facility,
    MonitoringPoint,
    AuditEvent,
    Permit,
    PermitLimit,
    OutboxMessage,
    OutboxAttachment,
  ];
  for (const m of models) m.initModel(sequelize);
  associate();
  initialised.add(sequelize);
}
