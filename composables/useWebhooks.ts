import type { WebhookCreateBody, WebhookUpdateBody } from '#shared/schemas/webhook'
import type { WebhookDeliveryDto, WebhookEndpointDto } from '#shared/types/webhook'

/**
 * Webhook endpoints (Admin → Webhooks): register one (its signing secret is in the answer, once), pause or
 * resume it, send it a test message; each endpoint's deliveries with every attempt, and a replay.
 */
export async function useWebhooks() {
  const endpoints = await useFetch<WebhookEndpointDto[]>('/api/admin/webhooks', { key: 'webhook-endpoints' })
  return {
    ...endpoints,
    register: async (body: WebhookCreateBody) => {
      const created = await $fetch<WebhookEndpointDto & { secret: string }>('/api/admin/webhooks', { method: 'POST', body })
      await endpoints.refresh()
      return created
    },
    change: async (id: number, body: WebhookUpdateBody) => {
      await $fetch(`/api/admin/webhooks/${id}`, { method: 'PATCH', body })
      await endpoints.refresh()
    },
    sendTest: (id: number) => $fetch<WebhookDeliveryDto>(`/api/admin/webhooks/${id}/test`, { method: 'POST' }),
    deliveries: (id: number) => $fetch<WebhookDeliveryDto[]>(`/api/admin/webhooks/${id}/deliveries`),
    replay: (deliveryId: number) => $fetch<WebhookDeliveryDto>(`/api/admin/webhooks/deliveries/${deliveryId}/replay`, { method: 'POST' }),
  }
}
