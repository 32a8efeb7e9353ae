import type { AuthorisationCreateBody, AuthorisationUpdateBody } from '#shared/schemas/authorisation'
import type { AuthorisationDto } from '#shared/types/authorisation'

/** The register of certifying authorisations (administrators): issue, change terms, suspend, reinstate. */
export async function useAuthorisationRegister() {
  const register = await useFetch<AuthorisationDto[]>('/api/admin/authorisations', { key: 'authorisation-register' })
  const after = async <T>(request: Promise<T>) => {
    const answer = await request
    await register.refresh()
    return answer
  }
  return {
    ...register,
    issue: (body: AuthorisationCreateBody) => after($fetch<AuthorisationDto>('/api/admin/authorisations', { method: 'POST', body })),
    change: (id: number, body: AuthorisationUpdateBody) =>
      after($fetch<AuthorisationDto>(`/api/admin/authorisations/${id}`, { method: 'PATCH', body })),
    suspend: (id: number, reason: string) =>
      after($fetch<AuthorisationDto>(`/api/admin/authorisations/${id}/suspend`, { method: 'POST', body: { reason } })),
    reinstate: (id: number) => after($fetch<AuthorisationDto>(`/api/admin/authorisations/${id}/reinstate`, { method: 'POST' })),
  }
}

/** The signed-in user's own certifying authorisations. */
export function useMyAuthorisations() {
  return useFetch<AuthorisationDto[]>('/api/me/authorisations', { key: 'my-authorisations' })
}
