import type { Sequelize } from 'sequelize';
import { AuditEvent } from './AuditEvent.js';
import { Facility } from './Facility.js';
import { MonitoringPoint } from './MonitoringPoint.js';
import { Exceedance, Notice } from './Exceedance.js';
import { Organization } from './Organization.js';
import { ProjectionAlert } from './ProjectionAlert.js';
import { Report } from './Report.js';
import { ReportBatch } from './ReportBatch.js';
import { OutboxAttachment, OutboxMessage } from './OutboxMessage.js';
import { Permit } from './Permit.js';
import { PermitLimit } from './PermitLimit.js';
import { User } from './User.js';
import { MeterCalibration } from './MeterCalibration.js';
import { QcBatch } from './QcBatch.js';
import { Sample } from './Sample.js';
import { Standardization } from './Standardization.js';
import { Titrant } from './Titrant.js';
import { Titration } from './Titration.js';
import { TitrationReading } from './TitrationReading.js';
import { BillingAccount } from './BillingAccount.js';
import { Invoice, InvoiceLine, InvoiceLineSample } from './Invoice.js';
import { InvoiceCounter } from './InvoiceCounter.js';
import { PaymentEvent } from './PaymentEvent.js';
import { PriceItem } from './PriceItem.js';
import { associate } from './associations.js';

export { Exceedance, Notice, ProjectionAlert, Report, ReportBatch };
export { AuditEvent, Facility, MonitoringPoint, Organization, OutboxAttachment, OutboxMessage, Permit, PermitLimit, User };
export { MeterCalibration, QcBatch, Sample, Standardization, Titrant, Titration, TitrationReading };
export { BillingAccount, Invoice, InvoiceCounter, InvoiceLine, InvoiceLineSample, PaymentEvent, PriceItem };

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
    Exceedance,
    Notice,
    ProjectionAlert,
    Report,
    ReportBatch,
  ];
  for (const m of models) m.initModel(sequelize);
  for (const m of [Titrant, Standardization, MeterCalibration, Sample, QcBatch, Titration, TitrationReading]) m.initModel(sequelize);
  for (const m of [PriceItem, BillingAccount, InvoiceCounter, Invoice, InvoiceLine, InvoiceLineSample, PaymentEvent]) m.initModel(sequelize);
  associate();
  initialised.add(sequelize);
}
