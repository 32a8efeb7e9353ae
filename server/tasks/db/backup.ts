import { databaseLocation } from '../../database/connection'
import { takeBackup } from '../../services/backup'

/**
 * `npm run backup [-- --out <folder>]`: a consistent copy of the configured database, taken while the server
 * keeps writing, with its manifest, in a new folder under `--out` (default `backups/`).
 */
export default defineTask({
  meta: { name: 'db:backup', description: 'Back up the database with a manifest' },
  async run() {
    const args = JSON.parse(process.env.CHARGEWELL_TASK_ARGS ?? '[]') as string[]
    const outIndex = args.indexOf('--out')
    const outDir = outIndex >= 0 && args[outIndex + 1] ? args[outIndex + 1]! : 'backups'
    const started = Date.now()
    const { folder, manifest } = await takeBackup(databaseLocation(useRuntimeConfig()), outDir)
    return { result: { folder, ...manifest, seconds: (Date.now() - started) / 1000 } }
  },
})
