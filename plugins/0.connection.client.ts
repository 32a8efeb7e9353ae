import { useConnectionStore } from '~~/stores/connection'

/**
 * Every request the app makes reports a request that got no answer to the connection store, so the
 * device knows it is offline from the first failed fetch, whatever the browser's flag says. Each
 * page navigation asks the server again.
 */
export default defineNuxtPlugin({
  name: 'connection',
  dependsOn: ['pinia'],
  setup() {
    const connection = useConnectionStore()
    globalThis.$fetch = globalThis.$fetch.create({
      onRequestError({ error }) {
        // Only "no network" (the browser's TypeError) says the device is offline; a request the page
        // abandoned, or one that timed out, says nothing of the kind.
        if (error?.name === 'TypeError') connection.lost()
      },
    }) as typeof globalThis.$fetch
    useRouter().afterEach(() => void connection.check())
  },
})
