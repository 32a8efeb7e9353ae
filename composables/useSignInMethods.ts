/** How one signs in here (password, the organisation's identity provider), for the sign-in page. */
export function useSignInMethods() {
  return useFetch<{ password: boolean, sso: { name: string, start: string } | null }>('/api/auth/methods', {
    key: 'sign-in-methods',
    default: () => ({ password: true, sso: null }),
  })
}
