import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { instrumentKinds } from '../../shared/schemas/instruments';

export class Instrument extends Model<InferAttributes<Instrument>, InferCreationAttributes<Instrument>> {
  declare id: string;
  declare name: string;
  declare kind: (typeof instrumentKinds)[number];
  declare manufacturer: string;
  declare model: string;
  declare serialNumber: string;
  declare calibratedOn: string | null;
  declare calibrationDueOn: string | null;
  declare notes: string;
  declare retired: boolean;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initialize(sequelize: Sequelize): void {
    Instrument.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        manufacturer: { type: DataTypes.TEXT, allowNull: false },
        model: { type: DataTypes.TEXT, allowNull: false },
        serialNumber: { type: DataTypes.TEXT, allowNull: false, unique: true },
        calibratedOn: { type: DataTypes.DATEONLY, allowNull: true },
        calibrationDueOn: { type: DataTypes.DATEONLY, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'instruments', modelName: 'Instrument' },
    );
  }
}
