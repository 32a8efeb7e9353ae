/** The OpenAPI description the server serves (/api/openapi.json), for the API reference page. */
export function useApiReference() {
  return useFetch<ApiReferenceDocument>('/api/openapi.json', { key: 'openapi' })
}
