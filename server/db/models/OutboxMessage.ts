import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<string>;
  declare dedupeKey: string;
  declare organizationId: number | null;
  declare toAddresses: string[];
  declare ccAddresses: string[] | null;
  declare subject: string;
  declare textBody: string;
  declare htmlBody: string | null;
  declare status: CreationOptional<'pending' | 'sending' | 'sent' | 'failed'>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date;
  declare lockedUntil: CreationOptional<Date | null>;
  declare lastError: CreationOptional<string | null>;
  declare messageId: CreationOptional<string | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    OutboxMessage.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        dedupeKey: { type: DataTypes.STRING(120), allowNull: false },
        organizationId: DataTypes.INTEGER,
        toAddresses: { type: DataTypes.JSON, allowNull: false },
        ccAddresses: DataTypes.JSON,
        subject: { type: DataTypes.STRING(300), allowNull: false },
        textBody: { type: DataTypes.TEXT('medium'), allowNull: false },
        htmlBody: DataTypes.TEXT('medium'),
        status: { type: DataTypes.ENUM('pending', 'sending', 'sent', 'failed'), allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE(3), allowNull: false },
        lockedUntil: DataTypes.DATE(3),
        lastError: DataTypes.STRING(1000),
        messageId: DataTypes.STRING(200),
        sentAt: DataTypes.DATE(3),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'outbox_messages' },
    );
  }
}

export class OutboxAttachment extends Model<InferAttributes<OutboxAttachment>, InferCreationAttributes<OutboxAttachment>> {
  declare id: CreationOptional<string>;
  declare messageId: string;
  declare filename: string;
  declare contentType: string;
  declare content: Buffer;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    OutboxAttachment.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        messageId: { type: DataTypes.BIGINT, allowNull: false },
        filename: { type: DataTypes.STRING(200), allowNull: false },
        contentType: { type: DataTypes.STRING(100), allowNull: false },
        content: { type: DataTypes.BLOB('long'), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'outbox_attachments', updatedAt: false },
    );
  }
}
