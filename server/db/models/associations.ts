import { AuditEvent } from './AuditEvent.js';
import { Facility } from './Facility.js';
import { MonitoringPoint } from './MonitoringPoint.js';
import { Exceedance, Notice } from './Exceedance.js';
import { Organization } from './Organization.js';
import { OutboxAttachment, OutboxMessage } from './OutboxMessage.js';
import { Permit } from './Permit.js';
import { PermitLimit } from './PermitLimit.js';
import { Report } from './Report.js';
import { User } from './User.js';
import { MeterCalibration } from './MeterCalibration.js';
import { QcBatch } from './QcBatch.js';
import { Sample } from './Sample.js';
import { Standardization } from './Standardization.js';
import { Titrant } from './Titrant.js';
import { Titration } from './Titration.js';
import { TitrationReading } from './TitrationReading.js';
import { Invoice, InvoiceLine, InvoiceLineSample } from './Invoice.js';
import { PriceItem } from './PriceItem.js';

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
  Exceedance.belongsTo(Facility, { as: 'facility', foreignKey: 'facilityId' });
  Exceedance.belongsTo(MonitoringPoint, { as: 'point', foreignKey: 'pointId' });
  Exceedance.belongsTo(Permit, { as: 'permit', foreignKey: 'permitId' });
  Exceedance.belongsTo(PermitLimit, { as: 'limit', foreignKey: 'limitId' });
  Exceedance.hasMany(Notice, { as: 'notices', foreignKey: 'exceedanceId' });
  Notice.belongsTo(Exceedance, { as: 'exceedance', foreignKey: 'exceedanceId' });
  Notice.belongsTo(OutboxMessage, { as: 'outbox', foreignKey: 'outboxMessageId' });
  Report.belongsTo(Facility, { as: 'facility', foreignKey: 'facilityId' });
  Report.belongsTo(User, { as: 'certifiedBy', foreignKey: 'certifiedById' });

  // Bench
  Titrant.hasMany(Standardization, { as: 'standardizations', foreignKey: 'titrantId' });
  Standardization.belongsTo(Titrant, { as: 'titrant', foreignKey: 'titrantId' });
  Standardization.belongsTo(User, { as: 'standardizedBy', foreignKey: 'standardizedById' });
  MeterCalibration.belongsTo(User, { as: 'calibratedBy', foreignKey: 'calibratedById' });
  Sample.belongsTo(MonitoringPoint, { as: 'point', foreignKey: 'pointId' });
  Sample.belongsTo(Facility, { as: 'facility', foreignKey: 'facilityId' });
  Sample.belongsTo(User, { as: 'createdBy', foreignKey: 'createdById' });
  Sample.hasMany(Titration, { as: 'titrations', foreignKey: 'sampleId' });
  Titration.belongsTo(Sample, { as: 'sample', foreignKey: 'sampleId' });
  Titration.belongsTo(Titrant, { as: 'titrant', foreignKey: 'titrantId' });
  Titration.hasMany(TitrationReading, { as: 'readings', foreignKey: 'titrationId' });
  for (const as of ['analyst', 'submittedBy', 'approvedBy', 'returnedBy', 'createdBy'] as const) Titration.belongsTo(User, { as, foreignKey: `${as}Id` });
  QcBatch.belongsTo(User, { as: 'analyst', foreignKey: 'analystId' });
  QcBatch.hasMany(Titration, { as: 'titrations', foreignKey: 'qcBatchId' });

  // Billing
  PriceItem.belongsTo(Organization, { as: 'client', foreignKey: 'clientId' });
  Invoice.belongsTo(Organization, { as: 'organization', foreignKey: 'organizationId' });
  Invoice.hasMany(InvoiceLine, { as: 'lines', foreignKey: 'invoiceId' });
  InvoiceLine.belongsTo(Invoice, { as: 'invoice', foreignKey: 'invoiceId' });
  InvoiceLine.hasMany(InvoiceLineSample, { as: 'samples', foreignKey: 'lineId' });
  InvoiceLineSample.belongsTo(Sample, { as: 'sample', foreignKey: 'sampleId' });
}
