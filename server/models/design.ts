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
import type { Circuit, LimitMaskData, Topology } from '../../shared/schemas/designs';
import type { User } from './user';

export class Design extends Model<InferAttributes<Design>, InferCreationAttributes<Design>> {
  declare id: string;
  declare name: string;
  declare description: string;
  declare createdById: ForeignKey<User['id']>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare revisions?: NonAttribute<DesignRevision[]>;
  declare createdBy?: NonAttribute<User>;

  static initialize(sequelize: Sequelize): void {
    Design.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        name: { type: DataTypes.TEXT, allowNull: false, unique: true },
        description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'designs', modelName: 'Design' },
    );
  }
}

/** A revision is never changed once written: an edit makes a new one. */
export class DesignRevision extends Model<InferAttributes<DesignRevision>, InferCreationAttributes<DesignRevision>> {
  declare id: string;
  declare designId: ForeignKey<Design['id']>;
  declare revision: number;
  declare label: string;
  declare topology: Topology;
  declare circuit: Circuit;
  declare limitMask: LimitMaskData;
  declare changeNote: string;
  declare createdById: ForeignKey<User['id']>;
  declare createdAt: CreationOptional<Date>;
  declare design?: NonAttribute<Design>;
  declare createdBy?: NonAttribute<User>;

  static initialize(sequelize: Sequelize): void {
    DesignRevision.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        revision: { type: DataTypes.INTEGER, allowNull: false },
        label: { type: DataTypes.TEXT, allowNull: false },
        topology: { type: DataTypes.TEXT, allowNull: false },
        circuit: { type: DataTypes.JSONB, allowNull: false },
        limitMask: { type: DataTypes.JSONB, allowNull: false },
        changeNote: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'design_revisions', modelName: 'DesignRevision', updatedAt: false },
    );
  }
}
