import { baseURL } from './file-server'

export const DEMO_PASSWORD = 'chargewell-demo'
export const DEMO = {
  technician: 'technician@chargewell.test',
  inspector: 'inspector@chargewell.test',
  engineer: 'engineer@chargewell.test',
  admin: 'admin@chargewell.test',
  lead: 'lead@chargewell.test',
} as const

/** The demo's users who see part of the organisation (the scope matrix signs them in). */
export const SCOPED_DEMO = {
  /** Granted Skelby only. */
  skelbyTechnician: 'skelby.technician@chargewell.test',
  /** Granted Skelby, and only Corran Isles Airways's aircraft there. */
  corranInspector: 'corran.inspector@chargewell.test',
  /** Granted Harlow Moor only. */
  harlowEngineer: 'harlow.engineer@chargewell.test',
} as const

// Route answers are checked field by field in the tests, so their body is loosely typed.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export interface ApiAnswer<T = any> {
  status: number
  body: T
  headers: Headers
}

/** One request to the test server; `cookie` carries a session from `signIn`. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export async function api<T = any>(
  path: string,
  options: { method?: string, body?: unknown, cookie?: string, raw?: string, headers?: Record<string, string> } = {},
): Promise<ApiAnswer<T>> {
  const headers: Record<string, string> = { accept: 'application/json', ...options.headers }
  if (options.cookie) headers.cookie = options.cookie
  let body: string | undefined
  if (options.raw !== undefined) body = options.raw
  else if (options.body !== undefined) body = JSON.stringify(options.body)
  if (body !== undefined) headers['content-type'] ??= 'application/json'
  const response = await fetch(`${baseURL()}${path}`, {
    method: options.method ?? (body ? 'POST' : 'GET'),
    headers,
    body,
  })
  const text = await response.text()
  let parsed: unknown = text
  try {
    parsed = text ? JSON.parse(text) : undefined
  }
  catch {
    /* not JSON: keep the text */
  }
  return { status: response.status, body: parsed as T, headers: response.headers }
}

const sessions = new Map<string, string>()

/** Signs in (once per e-mail per test file) and returns the session cookie. */
export async function signIn(email: string, password = DEMO_PASSWORD): Promise<string> {
  const cached = sessions.get(`${email}:${password}`)
  if (cached) return cached
  const response = await fetch(`${baseURL()}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  })
  if (response.status !== 200)
    throw new Error(`Sign-in of ${email} failed with ${response.status}: ${await response.text()}`)
  const cookie = response.headers
    .getSetCookie()
    .map(line => line.split(';')[0])
    .join('; ')
  sessions.set(`${email}:${password}`, cookie)
  return cookie
}

/** Signs in to a server the test started itself (not the file's own, not cached); answers the session cookie. */
export async function signInAt(baseURL: string, email: string, password = DEMO_PASSWORD): Promise<string> {
  const response = await fetch(`${baseURL}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  })
  if (response.status !== 200)
    throw new Error(`Sign-in of ${email} at ${baseURL} failed with ${response.status}: ${await response.text()}`)
  return response.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
}

/** Multipart upload with the session cookie. */
export async function upload(
  path: string,
  fields: Record<string, string>,
  file: { name: string, bytes: Uint8Array, type?: string },
  cookie?: string,
): Promise<ApiAnswer> {
  const form = new FormData()
  for (const [name, value] of Object.entries(fields)) form.append(name, value)
  form.append(
    'file',
    new Blob([file.bytes as Uint8Array<ArrayBuffer>], { type: file.type ?? 'application/octet-stream' }),
    file.name,
  )
  const response = await fetch(`${baseURL()}${path}`, { method: 'POST', body: form, headers: cookie ? { cookie } : {} })
  const text = await response.text()
  let body: unknown = text
  try {
    body = JSON.parse(text)
  }
  catch {
    /* not JSON */
  }
  return { status: response.status, body, headers: response.headers }
}
