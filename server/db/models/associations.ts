import { AuditEvent } from './AuditEvent.js';
import { Facility } from './Facility.js';
import { MonitoringPoint } from './MonitoringPoint.js';
import { Organization } from './Organization.js';
import { OutboxAttachment, OutboxMessage } from './OutboxMessage.js';
import { Permit } from './Permit.js';
import { PermitLimit } from './PermitLimit.js';
import { User } from './User.js';

/** Every association in one place. */
export function associate() {
  Organization.belongsTo(Organization, { as: 'lab', foreignKey: 'labId' });
  Organization.hasMany(Organization, { as: 'clients', foreignKey: 'labId' });
  User.belongsTo(Organization, { as: 'organization', foreignKey: 'organizationId' });
  Facility.belongsTo(Organization, { as: 'organization', foreignKey: 'organizationId' });
  Organization.hasMany(Facility, { as: 'facilities', foreignKey: 'organizationId' });
  MonitoringPoint.belongsTo(Facility, { as: 'facility', foreignKey: 'facilityId' });
  Facility.hasMany(MonitoringPoint, { as: 'points', foreignKey: 'facilityId' });
  AuditEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorUserId' });
  Permit.belongsTo(Facility, { as: 'facility', foreignKey: 'facilityId' });
  Permit.hasMany(PermitLimit, { as: 'limits', foreignKey: 'permitId' });
  PermitLimit.belongsTo(Permit, { as: 'permit', foreignKey: 'permitId' });
  PermitLimit.belongsTo(MonitoringPoint, { as: 'point', foreignKey: 'pointId' });
  OutboxMessage.hasMany(OutboxAttachment, { as: 'attachments', foreignKey: 'messageId' });
}
