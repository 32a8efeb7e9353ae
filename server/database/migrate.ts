import type { Sequelize } from 'sequelize'
import { SequelizeStorage, Umzug } from 'umzug'
import * as initial from '../migrations/0001-initial'
import * as trends from '../migrations/0002-trends'
import * as recordIntegrity from '../migrations/0003-record-integrity'
import * as sessions from '../migrations/0004-sessions'
import * as scale from '../migrations/0005-scale'
import * as traceability from '../migrations/0006-traceability'
import * as outbox from '../migrations/0007-outbox'
import * as cycleTrends from '../migrations/0008-cycle-trends'
import * as millionRows from '../migrations/0009-million-rows'
import * as trendTableOrder from '../migrations/0010-trend-table-order'
import * as passkeySignatures from '../migrations/0011-passkey-signatures'
import * as authorisations from '../migrations/0012-authorisations'
import * as stationsOperators from '../migrations/0013-stations-operators'
import * as apiTokens from '../migrations/0014-api-tokens'
import * as webhooks from '../migrations/0015-webhooks'
import * as singleSignOn from '../migrations/0016-single-sign-on'
import * as requestIds from '../migrations/0017-request-ids'
import * as auditPeriodIndex from '../migrations/0018-audit-period-index'
import * as searchPrefixes from '../migrations/0019-search-prefixes'

/** Every migration, in order. Listed here (not globbed) so the server bundle carries them. */
const MIGRATIONS = [
  { name: '0001-initial', ...initial },
  { name: '0002-trends', ...trends },
  { name: '0003-record-integrity', ...recordIntegrity },
  { name: '0004-sessions', ...sessions },
  { name: '0005-scale', ...scale },
  { name: '0006-traceability', ...traceability },
  { name: '0007-outbox', ...outbox },
  { name: '0008-cycle-trends', ...cycleTrends },
  { name: '0009-million-rows', ...millionRows },
  { name: '0010-trend-table-order', ...trendTableOrder },
  { name: '0011-passkey-signatures', ...passkeySignatures },
  { name: '0012-authorisations', ...authorisations },
  { name: '0013-stations-operators', ...stationsOperators },
  { name: '0014-api-tokens', ...apiTokens },
  { name: '0015-webhooks', ...webhooks },
  { name: '0016-single-sign-on', ...singleSignOn },
  { name: '0017-request-ids', ...requestIds },
  { name: '0018-audit-period-index', ...auditPeriodIndex },
  { name: '0019-search-prefixes', ...searchPrefixes },
]

/** Every migration's name, oldest first: a backup's migration level is one of these. */
export const MIGRATION_NAMES = MIGRATIONS.map(migration => migration.name)

/** Applies the migrations not yet applied; never drops or re-syncs tables. */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const umzug = new Umzug({
    migrations: MIGRATIONS.map(migration => ({
      name: migration.name,
      up: () => migration.up(sequelize.getQueryInterface()),
      down: () => migration.down(sequelize.getQueryInterface()),
    })),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  })
  const applied = await umzug.up()
  return applied.map(migration => migration.name)
}
