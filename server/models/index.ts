// Every model, and every association between them, in one place.
import type { Sequelize } from 'sequelize';
import { AccessToken } from './access-token';
import { AccountLink } from './account-link';
import { AuditEvent } from './audit-event';
import { BenchSession, BenchSessionInstrument } from './bench-session';
import { Design, DesignRevision } from './design';
import { Instrument } from './instrument';
import { Sweep } from './sweep';
import { User } from './user';
import { UserPreference } from './user-preference';

export { AccessToken, AccountLink, AuditEvent, BenchSession, BenchSessionInstrument, Design, DesignRevision, Instrument, Sweep, User, UserPreference };

export function initializeModels(sequelize: Sequelize): void {
  for (const model of [User, AccountLink, Instrument, Design, DesignRevision, BenchSession, BenchSessionInstrument, Sweep, AccessToken, UserPreference, AuditEvent]) {
    model.initialize(sequelize);
  }

  User.hasMany(AccountLink, { foreignKey: 'userId', as: 'links', onDelete: 'CASCADE' });
  AccountLink.belongsTo(User, { foreignKey: 'userId', as: 'user' });

  Design.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  Design.hasMany(DesignRevision, { foreignKey: 'designId', as: 'revisions' });
  DesignRevision.belongsTo(Design, { foreignKey: 'designId', as: 'design' });
  DesignRevision.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  DesignRevision.hasMany(BenchSession, { foreignKey: 'designRevisionId', as: 'sessions' });

  BenchSession.belongsTo(DesignRevision, { foreignKey: 'designRevisionId', as: 'designRevision' });
  BenchSession.belongsTo(User, { foreignKey: 'operatorId', as: 'operator' });
  BenchSession.belongsTo(User, { foreignKey: 'archivedById', as: 'archivedBy' });
  BenchSession.belongsToMany(Instrument, { through: BenchSessionInstrument, foreignKey: 'benchSessionId', otherKey: 'instrumentId', as: 'instruments' });
  BenchSession.hasMany(Sweep, { foreignKey: 'benchSessionId', as: 'sweeps' });

  Sweep.belongsTo(BenchSession, { foreignKey: 'benchSessionId', as: 'benchSession' });
  Sweep.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  Sweep.belongsTo(User, { foreignKey: 'deletedById', as: 'deletedBy' });

  AccessToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
}
