/**
 * Global setup for the `api` and `e2e` projects: builds the app once, copies `.output` to a
 * temporary folder (so a bundling mistake that only shows outside the repo fails here), and
 * seeds one template database. Each test file then starts its own server on its own copy of
 * that database (tests/support/file-server.ts), so files pass alone and in any order.
 *
 * CHARGEWELL_SKIP_BUILD=1 reuses an existing .output (for quick local runs).
 * CHARGEWELL_TEST_DATABASE_URL=postgres://… runs every server on PostgreSQL instead: the template
 * is a database seeded once, and each file's server gets a copy (CREATE DATABASE … TEMPLATE).
 */
import { execFileSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { cpSync, existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { createPostgresDatabase, dropPostgresDatabase, isPostgresUrl } from './postgres'

declare module 'vitest' {
  export interface ProvidedContext {
    outputDir: string
    templateDatabase: string
    sessionPassword: string
  }
}

interface Prepared {
  outputDir: string
  templateDatabase: string
  sessionPassword: string
  folder: string
  users: number
}

const shared = globalThis as typeof globalThis & { __chargewellPrepared?: Promise<Prepared> }
const root = resolve(import.meta.dirname, '../..')

async function prepare(): Promise<Prepared> {
  if (process.env.CHARGEWELL_SKIP_BUILD !== '1' || !existsSync(join(root, '.output/server/index.mjs'))) {
    execFileSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit' })
  }
  const folder = mkdtempSync(join(tmpdir(), 'chargewell-test-'))
  const outputDir = join(folder, 'output')
  cpSync(join(root, '.output'), outputDir, { recursive: true })
  // The seed seals the audit chain with the secret the servers will have.
  const sessionPassword = randomBytes(32).toString('hex')
  const postgres = process.env.CHARGEWELL_TEST_DATABASE_URL
  const templateDatabase = postgres
    ? await createPostgresDatabase(postgres, `chargewell_template_${process.pid}`)
    : join(folder, 'template.sqlite')
  // Seeded by the built server's own task, run from the copy (so the copy is what is tested).
  execFileSync(process.execPath, ['scripts/task.mjs', 'db:seed'], {
    cwd: root,
    env: {
      ...process.env,
      CHARGEWELL_OUTPUT: outputDir,
      NUXT_DB_PATH: postgres ? '' : templateDatabase,
      NUXT_DATABASE_URL: postgres ? templateDatabase : '',
      NUXT_SESSION_PASSWORD: sessionPassword,
      NUXT_AUDIT_SECRET: '',
      NUXT_UPLOADS_DIR: join(folder, 'seed-uploads'),
    },
    stdio: 'inherit',
  })
  // A SQLite template is copied file by file: fold the write-ahead log into it first.
  if (!postgres)
    execFileSync(
      process.execPath,
      [
        '-e',
        `const s=require('sqlite3');const d=new s.Database(${JSON.stringify(templateDatabase)});d.exec('PRAGMA wal_checkpoint(TRUNCATE)',e=>{if(e)throw e;d.close()})`,
      ],
      { cwd: root },
    )
  return { outputDir, templateDatabase, sessionPassword, folder, users: 0 }
}

export default async function setup(project: TestProject) {
  shared.__chargewellPrepared ??= prepare()
  let prepared: Prepared
  try {
    prepared = await shared.__chargewellPrepared
  }
  catch (error) {
    shared.__chargewellPrepared = undefined
    throw error
  }
  prepared.users++
  project.provide('outputDir', prepared.outputDir)
  project.provide('templateDatabase', prepared.templateDatabase)
  project.provide('sessionPassword', prepared.sessionPassword)
  return async () => {
    if (--prepared.users > 0) return
    rmSync(prepared.folder, { recursive: true, force: true })
    if (isPostgresUrl(prepared.templateDatabase)) await dropPostgresDatabase(prepared.templateDatabase)
    shared.__chargewellPrepared = undefined
  }
}
