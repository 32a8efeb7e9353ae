import { NAVIGATION, canSee, closedReason } from '#shared/navigation'

/** Page guard for the user's convenience only: the server checks every request itself. */
export default defineNuxtRouteMiddleware(async (to) => {
  // The verify page is for anyone holding a record (an auditor needs no account).
  if (to.meta.public) return
  const { loggedIn, user } = useUserSession()
  if (to.path === '/login') {
    if (loggedIn.value) return navigateTo('/')
    return
  }
  if (!loggedIn.value) return navigateTo({ path: '/login', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  const page = NAVIGATION.find(item => to.path === item.to || to.path.startsWith(`${item.to}/`))
  if (page && !canSee(page, user.value?.roles ?? [])) {
    return abortNavigation(createError({ statusCode: 403, statusMessage: closedReason(page) }))
  }
})
