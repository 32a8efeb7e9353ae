import { databaseLocation } from '../../database/connection'
import { BackupRefused, checkBackup, removeRestored, restoreCopy, verifyRestored } from '../../services/backup'

/**
 * `npm run restore -- <backup folder> --to <new SQLite file | postgres:// URL of an empty database>`: checks
 * the manifest (the copy whole, its SHA-256, a migration level this code knows), restores into the new
 * database, migrates it to this code's level and verifies the audit trail there before saying it succeeded.
 */
export default defineTask({
  meta: { name: 'db:restore', description: 'Restore a backup into a new database and verify it' },
  async run() {
    const [folder] = JSON.parse(process.env.CHARGEWELL_TASK_ARGS ?? '[]') as string[]
    if (!folder) throw new BackupRefused('Name the backup folder: npm run restore -- <folder> --to <database>.')
    // scripts/task.mjs has set the configured database to the --to target.
    const target = databaseLocation(useRuntimeConfig())
    const started = Date.now()
    const manifest = await checkBackup(folder)
    let restored = false
    try {
      await restoreCopy(folder, manifest, target)
      restored = true
      await useDB()
      const { checked } = await verifyRestored(manifest)
      const seconds = (Date.now() - started) / 1000
      const { createdAt: from, migration } = manifest
      return { result: { restored: target, from, migration: migration.level, auditEntriesVerified: checked, seconds } }
    }
    catch (error) {
      if (restored) removeRestored(target)
      throw error
    }
  },
})
