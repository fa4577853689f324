import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { BillingKind, InvoiceStatus } from '../../../shared/billing/money.js';
import type { Organization } from './Organization.js';
import type { Sample } from './Sample.js';

/** A lab's invoice to one client for a period: draft, then open (numbered, frozen), paid, void or refunded. */
export class Invoice extends Model<InferAttributes<Invoice>, InferCreationAttributes<Invoice>> {
  declare id: CreationOptional<number>;
  declare labId: number;
  declare organizationId: number;
  declare number: CreationOptional<string | null>;
  declare status: CreationOptional<InvoiceStatus>;
  declare currency: string;
  declare periodStart: string;
  declare periodEnd: string;
  declare totalCents: number;
  declare termsDays: CreationOptional<number | null>;
  declare issuedOn: CreationOptional<string | null>;
  declare dueOn: CreationOptional<string | null>;
  declare notes: CreationOptional<string | null>;
  declare finalisedAt: CreationOptional<Date | null>;
  declare finalisedById: CreationOptional<number | null>;
  declare voidedAt: CreationOptional<Date | null>;
  declare voidedById: CreationOptional<number | null>;
  declare voidReason: CreationOptional<string | null>;
  declare checkoutSessionId: CreationOptional<string | null>;
  declare paymentIntentId: CreationOptional<string | null>;
  declare paidCents: CreationOptional<number | null>;
  declare paidAt: CreationOptional<Date | null>;
  declare lastPaymentError: CreationOptional<string | null>;
  declare lastPaymentErrorAt: CreationOptional<Date | null>;
  declare refundId: CreationOptional<string | null>;
  declare refundedCents: CreationOptional<number | null>;
  declare refundedAt: CreationOptional<Date | null>;
  declare refundReason: CreationOptional<string | null>;
  declare createdById: number | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare organization?: NonAttribute<Organization>;
  declare lines?: NonAttribute<InvoiceLine[]>;

  static initModel(sequelize: Sequelize) {
    Invoice.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        labId: { type: DataTypes.INTEGER, allowNull: false },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        number: DataTypes.STRING(40),
        status: { type: DataTypes.ENUM('draft', 'open', 'paid', 'void', 'refunded'), allowNull: false, defaultValue: 'draft' },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        periodStart: { type: DataTypes.DATEONLY, allowNull: false },
        periodEnd: { type: DataTypes.DATEONLY, allowNull: false },
        totalCents: { type: DataTypes.INTEGER, allowNull: false },
        termsDays: DataTypes.INTEGER,
        issuedOn: DataTypes.DATEONLY,
        dueOn: DataTypes.DATEONLY,
        notes: DataTypes.STRING(1000),
        finalisedAt: DataTypes.DATE(3),
        finalisedById: DataTypes.INTEGER,
        voidedAt: DataTypes.DATE(3),
        voidedById: DataTypes.INTEGER,
        voidReason: DataTypes.STRING(1000),
        checkoutSessionId: DataTypes.STRING(100),
        paymentIntentId: DataTypes.STRING(100),
        paidCents: DataTypes.INTEGER,
        paidAt: DataTypes.DATE(3),
        lastPaymentError: DataTypes.STRING(500),
        lastPaymentErrorAt: DataTypes.DATE(3),
        refundId: DataTypes.STRING(100),
        refundedCents: DataTypes.INTEGER,
        refundedAt: DataTypes.DATE(3),
        refundReason: DataTypes.STRING(1000),
        createdById: DataTypes.INTEGER,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'invoices' },
    );
  }
}

/** One line of an invoice: a kind of analysis, count × unit price. */
export class InvoiceLine extends Model<InferAttributes<InvoiceLine>, InferCreationAttributes<InvoiceLine>> {
  declare id: CreationOptional<number>;
  declare invoiceId: number;
  declare position: number;
  declare kind: BillingKind;
  declare description: string;
  declare priceItemId: number | null;
  declare quantity: number;
  declare unitAmountCents: number;
  declare amountCents: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare samples?: NonAttribute<InvoiceLineSample[]>;

  static initModel(sequelize: Sequelize) {
    InvoiceLine.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        invoiceId: { type: DataTypes.INTEGER, allowNull: false },
        position: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.ENUM('alkalinity', 'acidity', 'speciation', 'rush'), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false },
        priceItemId: DataTypes.INTEGER,
        quantity: { type: DataTypes.INTEGER, allowNull: false },
        unitAmountCents: { type: DataTypes.INTEGER, allowNull: false },
        amountCents: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'invoice_lines' },
    );
  }
}

/** A sample (and the approved titration) behind an invoice line. */
export class InvoiceLineSample extends Model<InferAttributes<InvoiceLineSample>, InferCreationAttributes<InvoiceLineSample>> {
  declare id: CreationOptional<number>;
  declare lineId: number;
  declare invoiceId: number;
  declare sampleId: number;
  declare titrationId: number | null;
  declare kind: BillingKind;
  declare analysedAt: Date | null;
  declare sample?: NonAttribute<Sample>;

  static initModel(sequelize: Sequelize) {
    InvoiceLineSample.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        lineId: { type: DataTypes.INTEGER, allowNull: false },
        invoiceId: { type: DataTypes.INTEGER, allowNull: false },
        sampleId: { type: DataTypes.INTEGER, allowNull: false },
        titrationId: DataTypes.INTEGER,
        kind: { type: DataTypes.ENUM('alkalinity', 'acidity', 'speciation', 'rush'), allowNull: false },
        analysedAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: 'invoice_line_samples', timestamps: false },
    );
  }
}
