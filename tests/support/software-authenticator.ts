import { createHash, generateKeyPairSync, randomBytes, sign, type KeyObject } from 'node:crypto'

/**
 * A WebAuthn authenticator in software for route tests (the browser tests use Chromium's virtual
 * authenticator): an ES256 key pair per credential, "none" attestation, a signature counter. It
 * answers exactly what a browser would send, so the server's checks are the real ones.
 */

function cborHead(major: number, length: number): Buffer {
  if (length < 24) return Buffer.from([(major << 5) | length])
  if (length < 256) return Buffer.from([(major << 5) | 24, length])
  if (length < 65536) return Buffer.from([(major << 5) | 25, length >> 8, length & 0xFF])
  const head = Buffer.alloc(5)
  head[0] = (major << 5) | 26
  head.writeUInt32BE(length, 1)
  return head
}

type Cbor = number | string | Uint8Array | Map<Cbor, Cbor> | { [key: string]: Cbor }
function cbor(value: Cbor): Buffer {
  if (typeof value === 'number') return value >= 0 ? cborHead(0, value) : cborHead(1, -1 - value)
  if (typeof value === 'string') return Buffer.concat([cborHead(3, Buffer.byteLength(value)), Buffer.from(value)])
  if (value instanceof Uint8Array) return Buffer.concat([cborHead(2, value.length), Buffer.from(value)])
  const entries = value instanceof Map ? [...value.entries()] : Object.entries(value)
  return Buffer.concat([cborHead(5, entries.length), ...entries.flatMap(([key, item]) => [cbor(key), cbor(item)])])
}

const sha256 = (data: Buffer | string) => createHash('sha256').update(data).digest()
const b64url = (data: Buffer | Uint8Array) => Buffer.from(data).toString('base64url')

export class SoftwareAuthenticator {
  readonly credentialId = randomBytes(32)
  private readonly privateKey: KeyObject
  private readonly publicJwk: { x: string, y: string }
  private counter = 0

  constructor(private readonly origin: string) {
    const { privateKey, publicKey } = generateKeyPairSync('ec', { namedCurve: 'P-256' })
    this.privateKey = privateKey
    this.publicJwk = publicKey.export({ format: 'jwk' }) as { x: string, y: string }
  }

  get id(): string {
    return b64url(this.credentialId)
  }

  /** The COSE public key, base64url, as a server's register keeps it. */
  get publicKey(): string {
    return b64url(this.coseKey())
  }

  private get rpIdHash(): Buffer {
    return sha256(new URL(this.origin).hostname)
  }

  private coseKey(): Buffer {
    return cbor(new Map<Cbor, Cbor>([
      [1, 2], [3, -7], [-1, 1],
      [-2, Buffer.from(this.publicJwk.x, 'base64url')],
      [-3, Buffer.from(this.publicJwk.y, 'base64url')],
    ]))
  }

  /** The answer to `navigator.credentials.create` for these options. */
  register(options: { challenge: string }) {
    const clientDataJSON = Buffer.from(JSON.stringify({ type: 'webauthn.create', challenge: options.challenge, origin: this.origin, crossOrigin: false }))
    const idLength = Buffer.alloc(2)
    idLength.writeUInt16BE(this.credentialId.length)
    const authData = Buffer.concat([
      this.rpIdHash,
      Buffer.from([0x45]),
      Buffer.alloc(4),
      Buffer.alloc(16),
      idLength,
      this.credentialId,
      this.coseKey(),
    ])
    const attestationObject = cbor({ fmt: 'none', attStmt: new Map(), authData })
    return {
      id: this.id,
      rawId: this.id,
      type: 'public-key' as const,
      response: { clientDataJSON: b64url(clientDataJSON), attestationObject: b64url(attestationObject), transports: ['usb' as const] },
      clientExtensionResults: {},
      authenticatorAttachment: 'cross-platform' as const,
    }
  }

  /** The answer to `navigator.credentials.get` for a challenge: what a signature sends. */
  assert(challenge: string, origin = this.origin) {
    this.counter += 1
    const clientDataJSON = Buffer.from(JSON.stringify({ type: 'webauthn.get', challenge, origin, crossOrigin: false }))
    const count = Buffer.alloc(4)
    count.writeUInt32BE(this.counter)
    const authenticatorData = Buffer.concat([this.rpIdHash, Buffer.from([0x05]), count])
    const signature = sign('sha256', Buffer.concat([authenticatorData, sha256(clientDataJSON)]), this.privateKey)
    return {
      id: this.id,
      rawId: this.id,
      type: 'public-key' as const,
      response: {
        clientDataJSON: b64url(clientDataJSON),
        authenticatorData: b64url(authenticatorData),
        signature: b64url(signature),
      },
      clientExtensionResults: {},
    }
  }
}
