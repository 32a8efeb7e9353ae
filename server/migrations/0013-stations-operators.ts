import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize'

/**
 * Stations and operators. A station (`stations`) is where aircraft are based, with its own time zone and
 * field elevation; its name is what an aircraft's `base` holds, so aircraft written before keep their
 * content (and their audit hash). An operator (`operators`) owns aircraft; `aircraft.operator_id` is empty
 * on aircraft written before, which belong to the organisation's own fleet (the operator marked `own`).
 * Users get the stations and operators they may see (`users.station_ids`, `users.operator_ids`; empty:
 * every one, as before).
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  await queryInterface.createTable('stations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(60), allowNull: false, unique: true },
    code: { type: DataTypes.STRING(8), allowNull: false, unique: true },
    time_zone: { type: DataTypes.STRING(60), allowNull: false },
    elevation_value: { type: DataTypes.DOUBLE, allowNull: false },
    elevation_unit: { type: DataTypes.STRING(2), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.createTable('operators', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    code: { type: DataTypes.STRING(8), allowNull: false, unique: true },
    own: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.addColumn('aircraft', 'operator_id', {
    type: DataTypes.INTEGER,
    allowNull: true,
    references: { model: 'operators', key: 'id' },
  })
  await queryInterface.addIndex('aircraft', ['operator_id'])
  await queryInterface.addColumn('users', 'station_ids', { type: DataTypes.JSON, allowNull: true })
  await queryInterface.addColumn('users', 'operator_ids', { type: DataTypes.JSON, allowNull: true })

  // Every base an aircraft already names becomes a station, in the time zone the server was configured with.
  const now = new Date()
  const timeZone = process.env.NUXT_PUBLIC_STATION_TIME_ZONE || 'UTC'
  const bases = await sequelize.query<{ base: string }>('SELECT DISTINCT base FROM aircraft ORDER BY base', { type: QueryTypes.SELECT })
  const codes = new Set<string>()
  const rows = bases.map(({ base }) => {
    const letters = base.toUpperCase().replace(/[^A-Z0-9]/g, '') || 'STN'
    let code = letters.slice(0, 3)
    for (let suffix = 2; codes.has(code); suffix++) code = `${letters.slice(0, 3)}${suffix}`
    codes.add(code)
    return { name: base.slice(0, 60), code, time_zone: timeZone, elevation_value: 0, elevation_unit: 'ft', created_at: now, updated_at: now }
  })
  if (rows.length > 0) await queryInterface.bulkInsert('stations', rows)
  await queryInterface.bulkInsert('operators', [{
    name: (process.env.NUXT_OPERATOR_NAME || 'Own fleet').slice(0, 120),
    code: 'OWN',
    own: true,
    created_at: now,
    updated_at: now,
  }])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeColumn('users', 'operator_ids')
  await queryInterface.removeColumn('users', 'station_ids')
  await queryInterface.removeIndex('aircraft', ['operator_id'])
  await queryInterface.removeColumn('aircraft', 'operator_id')
  await queryInterface.dropTable('operators')
  await queryInterface.dropTable('stations')
}
