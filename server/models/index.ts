// Every model, and every association between them, in one place.
import type { Sequelize } from 'sequelize';
import { AccountLink } from './account-link';
import { User } from './user';

export { AccountLink, User };

export function initializeModels(sequelize: Sequelize): void {
  User.initialize(sequelize);
  AccountLink.initialize(sequelize);

  User.hasMany(AccountLink, { foreignKey: 'userId', as: 'links', onDelete: 'CASCADE' });
  AccountLink.belongsTo(User, { foreignKey: 'userId', as: 'user' });
}
