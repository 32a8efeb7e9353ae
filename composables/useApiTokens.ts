import type { ApiTokenCreateBody } from '#shared/schemas/api-token'
import type { ApiTokenDto } from '#shared/types/api-token'

/**
 * API tokens: the signed-in user's own, or (`every`, administrators) everyone's — issue (the token is in the
 * answer, once; an administrator names whose account it acts for), revoke.
 */
export async function useApiTokens(every = false) {
  const tokens = await useFetch<ApiTokenDto[]>(every ? '/api/admin/tokens' : '/api/me/tokens', { key: every ? 'all-api-tokens' : 'my-api-tokens' })
  return {
    ...tokens,
    issue: async (body: ApiTokenCreateBody, holderId?: number) => {
      const path = every && holderId ? `/api/admin/users/${holderId}/tokens` : '/api/me/tokens'
      const issued = await $fetch<ApiTokenDto & { token: string }>(path, { method: 'POST', body })
      await tokens.refresh()
      return issued
    },
    revoke: async (id: number) => {
      await $fetch(every ? `/api/admin/tokens/${id}/revoke` : `/api/me/tokens/${id}/revoke`, { method: 'POST' })
      await tokens.refresh()
    },
  }
}
