import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { Drive } from '../../shared/schemas/bench-sessions';
import type { DesignRevision } from './design';
import type { Instrument } from './instrument';
import type { Sweep } from './sweep';
import type { User } from './user';

export class BenchSession extends Model<InferAttributes<BenchSession>, InferCreationAttributes<BenchSession>> {
  declare id: string;
  declare designRevisionId: ForeignKey<DesignRevision['id']>;
  declare unitSerial: string;
  declare fixture: string;
  declare ambientTemperatureC: number | null;
  declare differentialDrive: Drive;
  declare commonModeDrive: Drive;
  declare hazardousDrive: boolean;
  declare notes: string;
  declare status: 'open' | 'archived';
  declare archivedAt: Date | null;
  declare archivedById: ForeignKey<User['id']> | null;
  declare operatorId: ForeignKey<User['id']>;
  declare measuredAt: Date;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare designRevision?: NonAttribute<DesignRevision>;
  declare operator?: NonAttribute<User>;
  declare archivedBy?: NonAttribute<User | null>;
  declare instruments?: NonAttribute<Instrument[]>;
  declare sweeps?: NonAttribute<Sweep[]>;

  static initialize(sequelize: Sequelize): void {
    BenchSession.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        unitSerial: { type: DataTypes.TEXT, allowNull: false },
        fixture: { type: DataTypes.TEXT, allowNull: false },
        ambientTemperatureC: { type: DataTypes.DOUBLE, allowNull: true },
        differentialDrive: { type: DataTypes.JSONB, allowNull: false },
        commonModeDrive: { type: DataTypes.JSONB, allowNull: false },
        hazardousDrive: { type: DataTypes.BOOLEAN, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'open' },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
        measuredAt: { type: DataTypes.DATE, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'bench_sessions', modelName: 'BenchSession' },
    );
  }
}

export class BenchSessionInstrument extends Model<InferAttributes<BenchSessionInstrument>, InferCreationAttributes<BenchSessionInstrument>> {
  declare benchSessionId: string;
  declare instrumentId: string;
  declare role: string;

  static initialize(sequelize: Sequelize): void {
    BenchSessionInstrument.init(
      {
        benchSessionId: { type: DataTypes.TEXT, primaryKey: true },
        instrumentId: { type: DataTypes.TEXT, primaryKey: true },
        role: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      },
      { sequelize, tableName: 'bench_session_instruments', modelName: 'BenchSessionInstrument', timestamps: false },
    );
  }
}
