import { signOut } from '../../services/sessions'

/** Signs out: the session ends on the server, so the old cookie no longer works. Harmless without one. */
export default defineEventHandler(async (event) => {
  await signOut(event)
  return { signedOut: true }
})
