import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { User } from './user';

export type AccountLinkPurpose = 'invite' | 'reset';

/** A single-use, expiring link e-mailed to a person: an invitation or a password reset. */
export class AccountLink extends Model<InferAttributes<AccountLink>, InferCreationAttributes<AccountLink>> {
  declare id: string;
  declare userId: ForeignKey<User['id']>;
  declare purpose: AccountLinkPurpose;
  /** SHA-256 of the token; the token itself exists only in the e-mail. */
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initialize(sequelize: Sequelize): void {
    AccountLink.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        purpose: { type: DataTypes.TEXT, allowNull: false },
        tokenHash: { type: DataTypes.TEXT, allowNull: false, unique: true },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        usedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'account_links', modelName: 'AccountLink' },
    );
  }
}
