import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize'

/**
 * Record integrity: a row version and a signing round on every worksheet (state changes are
 * compare-and-set on them), one performer and one inspector signature per round enforced by
 * the database, the record's content hash on each audit event, a sealed chain head, and the
 * address of each sign-in attempt.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  await queryInterface.addColumn('worksheets', 'version', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })
  await queryInterface.addColumn('worksheets', 'round', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })
  await queryInterface.addColumn('signatures', 'round', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })

  // Rounds of records signed before this migration: each performer signature opens a round; an
  // inspector signature belongs to the round it follows; a returned record is in the next round.
  const signatures = await sequelize.query<{ id: number, worksheet_id: number, capacity: string }>(
    'SELECT id, worksheet_id, capacity FROM signatures ORDER BY worksheet_id, signed_at, id', { type: QueryTypes.SELECT })
  const roundOf = new Map<number, number>()
  for (const signature of signatures) {
    const round = (roundOf.get(signature.worksheet_id) ?? 0) + (signature.capacity === 'performer' ? 1 : 0)
    roundOf.set(signature.worksheet_id, round)
    await sequelize.query('UPDATE signatures SET round = ? WHERE id = ?', { replacements: [Math.max(round, 1), signature.id] })
  }
  for (const [worksheetId, round] of roundOf) {
    await sequelize.query('UPDATE worksheets SET round = ? WHERE id = ?', { replacements: [Math.max(round, 1), worksheetId] })
  }
  await sequelize.query('UPDATE worksheets SET round = round + 1 WHERE state = \'returned\'')

  await queryInterface.addIndex('signatures', ['worksheet_id', 'round', 'capacity'], { unique: true, name: 'signatures_one_per_round' })

  await queryInterface.addColumn('audit_events', 'record_hash', { type: DataTypes.STRING(64), allowNull: true })
  // 1: the first chain (entry fields only); 2: also the record's content hash.
  await queryInterface.addColumn('audit_events', 'hash_version', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })
  // Each entry has one successor at most: a forked chain cannot be written.
  await queryInterface.addIndex('audit_events', ['previous_hash'], { unique: true, name: 'audit_events_one_successor' })
  await queryInterface.addIndex('audit_events', ['entity', 'entity_id'])

  await queryInterface.createTable('audit_heads', {
    id: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
    event_count: { type: DataTypes.INTEGER, allowNull: false },
    last_event_id: { type: DataTypes.INTEGER, allowNull: true },
    last_hash: { type: DataTypes.STRING(64), allowNull: false },
    // HMAC of the three fields above with the server's audit secret; null until the server seals it.
    seal: { type: DataTypes.STRING(64), allowNull: true },
    sealed_at: { type: DataTypes.DATE, allowNull: true },
  })
  const [last] = await sequelize.query<{ id: number, hash: string }>('SELECT id, hash FROM audit_events ORDER BY id DESC LIMIT 1', { type: QueryTypes.SELECT })
  const [{ count }] = await sequelize.query<{ count: number | string }>('SELECT COUNT(*) AS count FROM audit_events', { type: QueryTypes.SELECT }) as [{ count: number | string }]
  await queryInterface.bulkInsert('audit_heads', [{
    id: 1, event_count: Number(count), last_event_id: last?.id ?? null, last_hash: last?.hash ?? '0'.repeat(64), seal: null, sealed_at: null,
  }])

  await queryInterface.addColumn('attachments', 'sha256', { type: DataTypes.STRING(64), allowNull: true })

  await queryInterface.addColumn('login_attempts', 'address', { type: DataTypes.STRING(64), allowNull: true })
  await queryInterface.addIndex('login_attempts', ['address', 'at'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeIndex('login_attempts', ['address', 'at'])
  await queryInterface.removeColumn('login_attempts', 'address')
  await queryInterface.removeColumn('attachments', 'sha256')
  await queryInterface.dropTable('audit_heads')
  await queryInterface.removeIndex('audit_events', ['entity', 'entity_id'])
  await queryInterface.removeIndex('audit_events', 'audit_events_one_successor')
  await queryInterface.removeColumn('audit_events', 'hash_version')
  await queryInterface.removeColumn('audit_events', 'record_hash')
  await queryInterface.removeIndex('signatures', 'signatures_one_per_round')
  await queryInterface.removeColumn('signatures', 'round')
  await queryInterface.removeColumn('worksheets', 'round')
  await queryInterface.removeColumn('worksheets', 'version')
}
