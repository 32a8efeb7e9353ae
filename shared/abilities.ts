import type { Role } from './types/user'

/**
 * Who may do what, for every resource: one table asked by the server routes (`requireAbility`),
 * the pages (`useAbility`, the navigation and page guards) and the role-table test. A route
 * names the ability it needs; nothing else lists roles.
 *
 * `signed-in`: any user with a live session. Record-level rules (not your own worksheet, only
 * while awaiting countersign …) sit on top of these in shared/utils/worksheet-rules.ts and
 * shared/utils/cycle-check-rules.ts.
 */
export const ABILITIES = {
  'calculation.run': 'signed-in',
  'register.read': 'signed-in',
  'fleet.manage': ['admin'],
  'tool.manage': ['admin'],
  'specification.manage': ['engineer'],
  'worksheet.read': 'signed-in',
  /** Start, fill, sign, discard your own worksheets; attach photos to them. */
  'worksheet.perform': ['technician'],
  /** Countersign or return others' worksheets. */
  'worksheet.inspect': ['inspector'],
  /** Sign in either capacity (asks how: password or passkey). */
  'worksheet.sign': ['technician', 'inspector'],
  'worksheet.void': ['inspector', 'admin'],
  'study.read': ['engineer', 'admin'],
  'study.edit': ['engineer', 'admin'],
  'trend.read': 'signed-in',
  'cycle-check.read': 'signed-in',
  'cycle-check.record': ['technician', 'engineer'],
  /** Correct or withdraw any cycle check (the one who recorded a check may always correct or withdraw it). */
  'cycle-check.review': ['engineer'],
  'user.manage': ['admin'],
  'audit.verify': ['admin'],
  'outbox.read': ['admin'],
  /** Register webhook endpoints, see their deliveries, replay them. */
  'integration.manage': ['admin'],
  'account.own': 'signed-in',
} as const satisfies Record<string, 'signed-in' | readonly Role[]>

export type Ability = keyof typeof ABILITIES

/** The roles that hold an ability (every role for `signed-in`). */
export function rolesFor(ability: Ability, all: readonly Role[]): readonly Role[] {
  const holders = ABILITIES[ability]
  return holders === 'signed-in' ? all : holders
}

/** Whether a user with these roles holds the ability. */
export function can(roles: readonly Role[] | undefined, ability: Ability): boolean {
  const holders = ABILITIES[ability]
  if (!roles) return false
  return holders === 'signed-in' || roles.some(role => (holders as readonly Role[]).includes(role))
}

/** The words of a refusal: "This needs the engineer or admin role." */
export function refusal(ability: Ability): string {
  const holders = ABILITIES[ability]
  return holders === 'signed-in' ? 'Please sign in first.' : `This needs the ${holders.join(' or ')} role.`
}
