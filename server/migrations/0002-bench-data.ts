import { DataTypes, type QueryInterface } from 'sequelize';

// Instruments, designs and their revisions, bench sessions, sweeps and their points,
// personal access tokens, per-person preferences and the audit trail.
export async function up({ context: queryInterface }: { context: QueryInterface }): Promise<void> {
  const id = { type: DataTypes.TEXT, primaryKey: true };
  const timestamps = {
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  };
  const userRef = (allowNull: boolean) => ({
    type: DataTypes.TEXT,
    allowNull,
    references: { model: 'users', key: 'id' },
    onDelete: 'RESTRICT',
  });

  await queryInterface.createTable('instruments', {
    id,
    name: { type: DataTypes.TEXT, allowNull: false },
    kind: { type: DataTypes.TEXT, allowNull: false },
    manufacturer: { type: DataTypes.TEXT, allowNull: false },
    model: { type: DataTypes.TEXT, allowNull: false },
    serial_number: { type: DataTypes.TEXT, allowNull: false, unique: true },
    calibrated_on: { type: DataTypes.DATEONLY, allowNull: true },
    calibration_due_on: { type: DataTypes.DATEONLY, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });

  await queryInterface.createTable('designs', {
    id,
    name: { type: DataTypes.TEXT, allowNull: false, unique: true },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    created_by_id: userRef(false),
    ...timestamps,
  });

  await queryInterface.createTable('design_revisions', {
    id,
    design_id: { type: DataTypes.TEXT, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete: 'CASCADE' },
    revision: { type: DataTypes.INTEGER, allowNull: false },
    label: { type: DataTypes.TEXT, allowNull: false },
    topology: { type: DataTypes.TEXT, allowNull: false },
    circuit: { type: DataTypes.JSONB, allowNull: false },
    limit_mask: { type: DataTypes.JSONB, allowNull: false },
    change_note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    created_by_id: userRef(false),
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addConstraint('design_revisions', { type: 'unique', fields: ['design_id', 'revision'], name: 'design_revisions_design_revision_unique' });
  await queryInterface.sequelize.query(
    `ALTER TABLE design_revisions ADD CONSTRAINT design_revisions_topology_check CHECK (topology IN ('difference-amplifier', 'instrumentation-amplifier'))`,
  );

  await queryInterface.createTable('bench_sessions', {
    id,
    design_revision_id: { type: DataTypes.TEXT, allowNull: false, references: { model: 'design_revisions', key: 'id' }, onDelete: 'RESTRICT' },
    unit_serial: { type: DataTypes.TEXT, allowNull: false },
    fixture: { type: DataTypes.TEXT, allowNull: false },
    ambient_temperature_c: { type: DataTypes.DOUBLE, allowNull: true },
    differential_drive: { type: DataTypes.JSONB, allowNull: false },
    common_mode_drive: { type: DataTypes.JSONB, allowNull: false },
    hazardous_drive: { type: DataTypes.BOOLEAN, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'open' },
    archived_at: { type: DataTypes.DATE, allowNull: true },
    archived_by_id: userRef(true),
    operator_id: userRef(false),
    measured_at: { type: DataTypes.DATE, allowNull: false },
    ...timestamps,
  });
  await queryInterface.sequelize.query(`ALTER TABLE bench_sessions ADD CONSTRAINT bench_sessions_status_check CHECK (status IN ('open', 'archived'))`);
  await queryInterface.addIndex('bench_sessions', ['design_revision_id']);
  await queryInterface.addIndex('bench_sessions', ['unit_serial']);

  await queryInterface.createTable('bench_session_instruments', {
    bench_session_id: { type: DataTypes.TEXT, allowNull: false, primaryKey: true, references: { model: 'bench_sessions', key: 'id' }, onDelete: 'CASCADE' },
    instrument_id: { type: DataTypes.TEXT, allowNull: false, primaryKey: true, references: { model: 'instruments', key: 'id' }, onDelete: 'RESTRICT' },
    role: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
  });

  await queryInterface.createTable('sweeps', {
    id,
    bench_session_id: { type: DataTypes.TEXT, allowNull: false, references: { model: 'bench_sessions', key: 'id' }, onDelete: 'CASCADE' },
    mode: { type: DataTypes.TEXT, allowNull: false },
    source: { type: DataTypes.TEXT, allowNull: false },
    source_name: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    client_key: { type: DataTypes.TEXT, allowNull: true },
    amplitude_convention: { type: DataTypes.TEXT, allowNull: false },
    state: { type: DataTypes.TEXT, allowNull: false },
    created_by_id: userRef(false),
    deleted_at: { type: DataTypes.DATE, allowNull: true },
    deleted_by_id: userRef(true),
    delete_reason: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
  await queryInterface.sequelize.query(`
    ALTER TABLE sweeps
      ADD CONSTRAINT sweeps_mode_check CHECK (mode IN ('differential', 'common-mode')),
      ADD CONSTRAINT sweeps_source_check CHECK (source IN ('upload', 'captures', 'stream', 'demo')),
      ADD CONSTRAINT sweeps_state_check CHECK (state IN ('streaming', 'complete')),
      ADD CONSTRAINT sweeps_convention_check CHECK (amplitude_convention IN ('peak', 'rms'))`);
  await queryInterface.addIndex('sweeps', ['bench_session_id']);
  await queryInterface.addIndex('sweeps', ['bench_session_id', 'client_key'], { unique: true, name: 'sweeps_session_client_key_unique' });

  // Points are many: a plain table with a composite key, written in batches by one statement.
  await queryInterface.sequelize.query(`
    CREATE TABLE sweep_points (
      sweep_id TEXT NOT NULL REFERENCES sweeps(id) ON DELETE CASCADE,
      sequence INTEGER NOT NULL,
      frequency_hz DOUBLE PRECISION NOT NULL CHECK (frequency_hz > 0),
      vin_v DOUBLE PRECISION NOT NULL CHECK (vin_v > 0),
      vout_v DOUBLE PRECISION NOT NULL CHECK (vout_v >= 0),
      phase_deg DOUBLE PRECISION,
      floor_v DOUBLE PRECISION CHECK (floor_v >= 0),
      source_line INTEGER,
      received_at TIMESTAMPTZ NOT NULL DEFAULT now(),
      PRIMARY KEY (sweep_id, sequence)
    )`);

  await queryInterface.createTable('access_tokens', {
    id,
    user_id: { type: DataTypes.TEXT, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.TEXT, allowNull: false },
    token_hash: { type: DataTypes.TEXT, allowNull: false, unique: true },
    token_prefix: { type: DataTypes.TEXT, allowNull: false },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await queryInterface.addIndex('access_tokens', ['user_id']);

  await queryInterface.createTable('user_preferences', {
    user_id: { type: DataTypes.TEXT, allowNull: false, primaryKey: true, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    key: { type: DataTypes.TEXT, allowNull: false, primaryKey: true },
    value: { type: DataTypes.JSONB, allowNull: false },
    ...timestamps,
  });

  await queryInterface.createTable('audit_events', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    actor_id: userRef(true),
    action: { type: DataTypes.TEXT, allowNull: false },
    subject_type: { type: DataTypes.TEXT, allowNull: false },
    subject_id: { type: DataTypes.TEXT, allowNull: false },
    details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('audit_events', ['subject_type', 'subject_id']);
}

export async function down({ context: queryInterface }: { context: QueryInterface }): Promise<void> {
  for (const table of ['audit_events', 'user_preferences', 'access_tokens', 'sweep_points', 'sweeps', 'bench_session_instruments', 'bench_sessions', 'design_revisions', 'designs', 'instruments']) {
    await queryInterface.dropTable(table);
  }
}
