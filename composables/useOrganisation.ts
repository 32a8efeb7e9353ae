import type { OperatorBody, StationBody, UserScopeBody } from '#shared/schemas/organisation'
import type { OperatorDto, ScopeDto, StationDto } from '#shared/types/organisation'
import type { PublicUser } from '#shared/types/user'

type Counted<T> = T & { aircraft: number }

/** The organisation's stations and operators (administrators): add, change. */
export async function useOrganisationRegister() {
  const [stations, operators] = await Promise.all([
    useFetch<Counted<StationDto>[]>('/api/admin/stations', { key: 'stations' }),
    useFetch<Counted<OperatorDto>[]>('/api/admin/operators', { key: 'operators' }),
  ])
  const after = async <T>(request: Promise<T>, list: { refresh: () => Promise<void> }) => {
    const answer = await request
    await list.refresh()
    return answer
  }
  return {
    stations,
    operators,
    addStation: (body: StationBody) => after($fetch<StationDto>('/api/admin/stations', { method: 'POST', body }), stations),
    changeStation: (id: number, body: Partial<Omit<StationBody, 'name'>>) =>
      after($fetch<StationDto>(`/api/admin/stations/${id}`, { method: 'PATCH', body }), stations),
    addOperator: (body: OperatorBody) => after($fetch<OperatorDto>('/api/admin/operators', { method: 'POST', body }), operators),
  }
}

/** Grants a user stations and operators (null: every one). */
export function grantScope(user: Pick<PublicUser, 'id'>, body: UserScopeBody) {
  return $fetch<PublicUser>(`/api/admin/users/${user.id}/scope`, { method: 'PUT', body })
}

/** What the signed-in user may see (`immediate: false` to ask only when needed). */
export function useMyScope(options: { immediate?: boolean } = {}) {
  return useFetch<ScopeDto>('/api/me/scope', { key: 'my-scope', immediate: options.immediate ?? true })
}

/** "Skelby · Corran Isles Airways" — a scope in words. */
export function scopeInWords(scope: ScopeDto): string {
  if (scope.whole) return 'Every station and operator'
  const stations = scope.everyStation ? 'Every station' : scope.stations.map(station => station.name).join(', ')
  const operators = scope.everyOperator ? 'every operator' : scope.operators.map(operator => operator.name).join(', ')
  return `${stations} · ${operators}`
}

/** The stations and operators, as choices in forms (administrators; nothing is asked for anyone else). */
export function useOrganisationChoices(enabled: MaybeRefOrGetter<boolean> = true) {
  const immediate = toValue(enabled)
  return {
    stations: useFetch<StationDto[]>('/api/admin/stations', { key: 'stations', immediate }).data,
    operators: useFetch<OperatorDto[]>('/api/admin/operators', { key: 'operators', immediate }).data,
  }
}
