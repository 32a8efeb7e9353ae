import { can, refusal, type Ability } from './abilities'
import type { Role } from './types/user'

export interface NavigationItem {
  label: string
  to: string
  /** The ability that opens the page (shared/abilities.ts). */
  ability: Ability
  description: string
}

/** The product's pages and what opens each. Page guards and the navigation both read this. */
export const NAVIGATION: NavigationItem[] = [
  { label: 'Charge target', to: '/charge-target', ability: 'calculation.run', description: 'The pre-charge to hold at the gas temperature now.' },
  { label: 'Worksheets', to: '/worksheets', ability: 'worksheet.read', description: 'Step-by-step servicing records.' },
  { label: 'Countersign', to: '/countersign', ability: 'worksheet.inspect', description: 'Worksheets awaiting independent inspection.' },
  { label: 'Sizing', to: '/sizing', ability: 'study.read', description: 'Usable volume, applications and required gas volume.' },
  { label: 'Due', to: '/due', ability: 'register.read', description: 'Accumulator checks falling due, by station.' },
  { label: 'Fleet', to: '/fleet', ability: 'register.read', description: 'Aircraft and installed accumulators.' },
  { label: 'Specifications', to: '/specifications', ability: 'register.read', description: 'Servicing specifications by part number and revision.' },
  { label: 'Tools', to: '/tools', ability: 'register.read', description: 'Gauges, calibration and nitrogen carts.' },
  { label: 'Trends', to: '/trends', ability: 'trend.read', description: 'Pre-charge loss and pump cycle intervals across the fleet.' },
  { label: 'Admin', to: '/admin', ability: 'user.manage', description: 'Users, roles and authorisations.' },
]

export function canSee(item: Pick<NavigationItem, 'ability'>, roles: readonly Role[]): boolean {
  return can(roles, item.ability)
}

export function navigationFor(roles: readonly Role[]): NavigationItem[] {
  return NAVIGATION.filter(item => canSee(item, roles))
}

/** Why a page is closed to a user, in words ("Sizing: this needs the engineer or admin role."). */
export function closedReason(item: NavigationItem): string {
  return `${item.label}: ${refusal(item.ability).replace(/^This/, 'this')}`
}
