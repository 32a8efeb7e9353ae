import type { PasskeyDto, SigningOptionsDto, SigningPolicy } from '#shared/types/signing'
import type { ConfirmDialog } from '~/utils/confirm'
import type { SignatureCapacity } from '#shared/types/worksheet'

/** The signed-in user's passkey register; adding one asks the device (or a security key) to create it. */
export async function useMyPasskeys() {
  const passkeys = await useFetch<PasskeyDto[]>('/api/me/passkeys', { key: 'my-passkeys' })
  async function add(name: string) {
    const { startRegistration } = await import('@simplewebauthn/browser')
    const started = await $fetch<{ options: Parameters<typeof startRegistration>[0]['optionsJSON'], ticket: string }>(
      '/api/me/passkeys/options',
      { method: 'POST' },
    )
    const response = await startRegistration({ optionsJSON: started.options })
    const added = await $fetch<PasskeyDto>('/api/me/passkeys', { method: 'POST', body: { name, ticket: started.ticket, response } })
    await passkeys.refresh()
    return added
  }
  async function revoke(passkey: Pick<PasskeyDto, 'id'>) {
    await $fetch(`/api/me/passkeys/${passkey.id}/revoke`, { method: 'POST' })
    await passkeys.refresh()
  }
  return { ...passkeys, add, revoke }
}

/** How a signature may be made here, and a passkey's request over exactly what would be signed now. */
export function signingOptionsFor(worksheetId: number, capacity: SignatureCapacity) {
  return $fetch<SigningOptionsDto>(`/api/worksheets/${worksheetId}/signing-options`, { query: { capacity } })
}

/** Asks the device or security key to sign; answers the assertion the server checks. */
export async function passkeyAssertion(options: NonNullable<SigningOptionsDto['passkey']>) {
  const { startAuthentication } = await import('@simplewebauthn/browser')
  return startAuthentication({ optionsJSON: options as unknown as Parameters<typeof startAuthentication>[0]['optionsJSON'] })
}

/** A browser's refusal of a passkey ceremony, in words. */
export function passkeyFailure(error: unknown): string {
  const name = (error as { name?: string }).name
  if (name === 'NotAllowedError') return 'The passkey was not used (cancelled, or it took too long). Nothing was signed or saved.'
  if (name === 'InvalidStateError') return 'That passkey or security key is already registered.'
  return errorMessage(error)
}

/** The signing options as the form opens (asked in the browser: a passkey lives on the device). */
export function useSigningOptions(worksheetId: number, version: number, capacity: SignatureCapacity) {
  return useAsyncData(`signing-options-${worksheetId}-${version}-${capacity}`, () => signingOptionsFor(worksheetId, capacity), {
    server: false,
  })
}

/** How each role signs (administrators): read, and saved with the change audited. */
export async function useSigningPolicy() {
  const policy = await useFetch<SigningPolicy & { updatedAt: string | null }>('/api/admin/signing-policy', { key: 'signing-policy' })
  async function save(chosen: SigningPolicy) {
    await $fetch('/api/admin/signing-policy', { method: 'PUT', body: chosen })
    await policy.refresh()
  }
  return { ...policy, save }
}

/** A user's passkey register, for an administrator: every key with its times; a lost key is revoked here. */
export async function useUserPasskeys(userId: MaybeRefOrGetter<number>) {
  const passkeys = await useFetch<PasskeyDto[]>(() => `/api/admin/users/${toValue(userId)}/passkeys`)
  async function revoke(passkey: Pick<PasskeyDto, 'id'>) {
    await $fetch(`/api/admin/users/${toValue(userId)}/passkeys/${passkey.id}/revoke`, { method: 'POST' })
    await passkeys.refresh()
  }
  return { ...passkeys, revoke }
}

/**
 * Revokes a passkey once its owner (or an administrator, naming the owner) confirmed it in the app's own
 * dialog; answers the notice to show, or null when they thought better of it.
 */
export async function revokeWhenConfirmed(
  confirmation: ConfirmDialog | null | undefined,
  passkey: Pick<PasskeyDto, 'id' | 'name'>,
  revoke: (passkey: Pick<PasskeyDto, 'id'>) => Promise<unknown>,
  owner?: string,
): Promise<{ text: string, failed: boolean } | null> {
  const ok = await confirmation?.ask({
    title: `Revoke “${passkey.name}”${owner ? ` of ${owner}` : ''}?`,
    body: 'It will not sign again. What it signed before stays verifiable.',
    confirm: 'Revoke passkey',
    tone: 'danger',
  })
  if (!ok) return null
  try {
    await revoke(passkey)
    return { text: `“${passkey.name}” is revoked.`, failed: false }
  }
  catch (failure) {
    return { text: errorMessage(failure), failed: true }
  }
}
