import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Who did what to which record, kept for the record (deletions are recorded, never silent). */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>;
  declare actorId: string | null;
  declare action: string;
  declare subjectType: string;
  declare subjectId: string;
  declare details: Record<string, unknown>;
  declare createdAt: CreationOptional<Date>;

  static initialize(sequelize: Sequelize): void {
    AuditEvent.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        actorId: { type: DataTypes.TEXT, allowNull: true },
        action: { type: DataTypes.TEXT, allowNull: false },
        subjectType: { type: DataTypes.TEXT, allowNull: false },
        subjectId: { type: DataTypes.TEXT, allowNull: false },
        details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'audit_events', modelName: 'AuditEvent', updatedAt: false },
    );
  }
}
