import { DataTypes, type QueryInterface } from 'sequelize';

// People, their sessions (the shape the session store expects) and e-mailed links.
export async function up({ context: queryInterface }: { context: QueryInterface }): Promise<void> {
  await queryInterface.createTable('users', {
    id: { type: DataTypes.TEXT, primaryKey: true },
    email: { type: DataTypes.TEXT, allowNull: false, unique: true },
    name: { type: DataTypes.TEXT, allowNull: false },
    role: { type: DataTypes.TEXT, allowNull: false },
    status: { type: DataTypes.TEXT, allowNull: false },
    password_hash: { type: DataTypes.TEXT, allowNull: true },
    last_sign_in_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.sequelize.query(`
    ALTER TABLE users
      ADD CONSTRAINT users_role_check CHECK (role IN ('technician', 'designer', 'lead')),
      ADD CONSTRAINT users_status_check CHECK (status IN ('invited', 'active', 'deactivated')),
      ADD CONSTRAINT users_email_lowercase CHECK (email = lower(email))`);

  await queryInterface.createTable('user_sessions', {
    id: { type: DataTypes.TEXT, primaryKey: true },
    user_id: {
      type: DataTypes.TEXT,
      allowNull: false,
      references: { model: 'users', key: 'id' },
      onDelete: 'CASCADE',
    },
    expires_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('user_sessions', ['user_id']);

  await queryInterface.createTable('account_links', {
    id: { type: DataTypes.TEXT, primaryKey: true },
    user_id: {
      type: DataTypes.TEXT,
      allowNull: false,
      references: { model: 'users', key: 'id' },
      onDelete: 'CASCADE',
    },
    purpose: { type: DataTypes.TEXT, allowNull: false },
    token_hash: { type: DataTypes.TEXT, allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.sequelize.query(
    `ALTER TABLE account_links ADD CONSTRAINT account_links_purpose_check CHECK (purpose IN ('invite', 'reset'))`,
  );
  await queryInterface.addIndex('account_links', ['user_id']);
}

export async function down({ context: queryInterface }: { context: QueryInterface }): Promise<void> {
  await queryInterface.dropTable('account_links');
  await queryInterface.dropTable('user_sessions');
  await queryInterface.dropTable('users');
}
