import { randomBytes } from 'node:crypto'
import pg from 'pg'

export function isPostgresUrl(location: string): boolean {
  return /^postgres(ql)?:\/\//.test(location)
}

function withDatabase(url: string, name: string): string {
  const parsed = new URL(url)
  parsed.pathname = `/${name}`
  return parsed.toString()
}

async function onServer<T>(url: string, work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: withDatabase(url, 'postgres') })
  await client.connect()
  try {
    return await work(client)
  }
  finally {
    await client.end()
  }
}

/** A new, empty database on the server of `url` (or a copy of `template`); returns its URL. */
export async function createPostgresDatabase(url: string, name: string, template?: string): Promise<string> {
  await onServer(url, async (client) => {
    await client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)
    await client.query(`CREATE DATABASE "${name}"${template ? ` TEMPLATE "${new URL(template).pathname.slice(1)}"` : ''}`)
  })
  return withDatabase(url, name)
}

/** A copy of the seeded template for one test server. */
export function copyPostgresDatabase(template: string): Promise<string> {
  return createPostgresDatabase(template, `chargewell_test_${randomBytes(6).toString('hex')}`, template)
}

export async function dropPostgresDatabase(url: string): Promise<void> {
  await onServer(url, client => client.query(`DROP DATABASE IF EXISTS "${new URL(url).pathname.slice(1)}" WITH (FORCE)`))
}
