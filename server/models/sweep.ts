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
import type { SweepMode } from '../../shared/schemas/sweeps';
import type { BenchSession } from './bench-session';
import type { User } from './user';

/** A sweep's header; its points live in `sweep_points`, written in batches (server/operations/sweep-points.ts). */
export class Sweep extends Model<InferAttributes<Sweep>, InferCreationAttributes<Sweep>> {
  declare id: string;
  declare benchSessionId: ForeignKey<BenchSession['id']>;
  declare mode: SweepMode;
  declare source: 'upload' | 'captures' | 'stream' | 'demo';
  declare sourceName: string;
  declare clientKey: string | null;
  declare amplitudeConvention: 'peak' | 'rms';
  declare state: 'streaming' | 'complete';
  declare createdById: ForeignKey<User['id']>;
  declare deletedAt: Date | null;
  declare deletedById: ForeignKey<User['id']> | null;
  declare deleteReason: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare createdBy?: NonAttribute<User>;
  declare deletedBy?: NonAttribute<User | null>;
  declare benchSession?: NonAttribute<BenchSession>;

  static initialize(sequelize: Sequelize): void {
    Sweep.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        mode: { type: DataTypes.TEXT, allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false },
        sourceName: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        clientKey: { type: DataTypes.TEXT, allowNull: true },
        amplitudeConvention: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false },
        deletedAt: { type: DataTypes.DATE, allowNull: true },
        deleteReason: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'sweeps', modelName: 'Sweep' },
    );
  }
}
