import { AuditEvent } from './AuditEvent.js';
import { Facility } from './Facility.js';
import { MonitoringPoint } from './MonitoringPoint.js';
import { Organization } from './Organization.js';
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
}
