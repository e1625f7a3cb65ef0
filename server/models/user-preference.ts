import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Small per-person settings the client remembers, such as the last column mapping. */
export class UserPreference extends Model<InferAttributes<UserPreference>, InferCreationAttributes<UserPreference>> {
  declare userId: string;
  declare key: string;
  declare value: unknown;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initialize(sequelize: Sequelize): void {
    UserPreference.init(
      {
        userId: { type: DataTypes.TEXT, primaryKey: true },
        key: { type: DataTypes.TEXT, primaryKey: true },
        value: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'user_preferences', modelName: 'UserPreference' },
    );
  }
}
