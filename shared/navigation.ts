import type { Role } from './types/user'

export interface NavigationItem {
  label: string
  to: string
  /** Any of these roles sees the item; empty: every signed-in user. */
  roles: Role[]
  description: string
}

/** The product's pages and who uses them. Page guards and the navigation both read this. */
export const NAVIGATION: NavigationItem[] = [
  { label: 'Charge target', to: '/charge-target', roles: [], description: 'The pre-charge to hold at the gas temperature now.' },
  { label: 'Worksheets', to: '/worksheets', roles: ['technician', 'inspector', 'engineer', 'admin'], description: 'Step-by-step servicing records.' },
  { label: 'Countersign', to: '/countersign', roles: ['inspector'], description: 'Worksheets awaiting independent inspection.' },
  { label: 'Sizing', to: '/sizing', roles: ['engineer', 'admin'], description: 'Usable volume, applications and required gas volume.' },
  { label: 'Fleet', to: '/fleet', roles: [], description: 'Aircraft and installed accumulators.' },
  { label: 'Specifications', to: '/specifications', roles: [], description: 'Servicing specifications by part number and revision.' },
  { label: 'Tools', to: '/tools', roles: [], description: 'Gauges, calibration and nitrogen carts.' },
  { label: 'Trends', to: '/trends', roles: [], description: 'Pre-charge loss and pump cycle intervals across the fleet.' },
  { label: 'Admin', to: '/admin', roles: ['admin'], description: 'Users, roles and authorisations.' },
]

export function canSee(item: Pick<NavigationItem, 'roles'>, roles: readonly Role[]): boolean {
  return item.roles.length === 0 || item.roles.some(role => roles.includes(role))
}

export function navigationFor(roles: readonly Role[]): NavigationItem[] {
  return NAVIGATION.filter(item => canSee(item, roles))
}
