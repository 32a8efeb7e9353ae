import type { ApiTokenCreateBody } from '#shared/schemas/api-token'
import type { ApiTokenDto } from '#shared/types/api-token'

/** The signed-in user's API tokens: issue (the token is in the answer, once), revoke. */
export async function useMyApiTokens() {
  const tokens = await useFetch<ApiTokenDto[]>('/api/me/tokens', { key: 'my-api-tokens' })
  return {
    ...tokens,
    issue: async (body: ApiTokenCreateBody) => {
      const issued = await $fetch<ApiTokenDto & { token: string }>('/api/me/tokens', { method: 'POST', body })
      await tokens.refresh()
      return issued
    },
    revoke: async (id: number) => {
      await $fetch(`/api/me/tokens/${id}/revoke`, { method: 'POST' })
      await tokens.refresh()
    },
  }
}
