import { can, type Ability } from '#shared/abilities'

/** Whether the signed-in user holds an ability (shared/abilities.ts): pages offer only what the server will allow. */
export function useAbility(ability: Ability) {
  const { user } = useUserSession()
  return computed(() => can(user.value?.roles, ability))
}
