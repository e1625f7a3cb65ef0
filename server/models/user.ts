import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Role } from '../../shared/schemas/users';

export type UserStatus = 'invited' | 'active' | 'deactivated';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: string;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare status: UserStatus;
  declare passwordHash: string | null;
  declare lastSignInAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initialize(sequelize: Sequelize): void {
    User.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        email: { type: DataTypes.TEXT, allowNull: false, unique: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        role: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false },
        passwordHash: { type: DataTypes.TEXT, allowNull: true },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', modelName: 'User' },
    );
  }
}
