import type { Role } from '../../shared/types/user'

/** Who may call each route. Every file under server/api must appear here (see roles.test.ts). */
export type Access = 'public' | 'signed-in' | Role[]

export const ROUTE_ACCESS: Record<string, Access> = {
  'GET /api/health': 'public',
  'POST /api/auth/login': 'public',
  'POST /api/auth/logout': 'public',
  'GET /api/me': 'signed-in',
  'PATCH /api/me/preferences': 'signed-in',
  'GET /api/admin/users': ['admin'],
  'POST /api/admin/users': ['admin'],
  'PATCH /api/admin/users/[id]': ['admin'],
  'POST /api/admin/users/[id]/password': ['admin'],
  'POST /api/calc/charge-target': 'signed-in',
  'POST /api/calc/table-target': 'signed-in',
  'POST /api/calc/correction-curve': 'signed-in',
  'POST /api/calc/assess-reading': 'signed-in',
  'POST /api/calc/usable-volume': 'signed-in',
  'POST /api/calc/required-volume': 'signed-in',
  'POST /api/calc/optimum-precharge': 'signed-in',
  'POST /api/calc/envelope': 'signed-in',
  'POST /api/calc/leak-rate': 'signed-in',
  'POST /api/calc/leak-interval': 'signed-in',
  'GET /api/specifications': 'signed-in',
  'GET /api/specifications/[id]': 'signed-in',
  'GET /api/accumulators': 'signed-in',
}
