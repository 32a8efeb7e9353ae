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
        // A request the page itself abandoned says nothing about the network.
        if (error?.name !== 'AbortError') connection.lost()
      },
    }) as typeof globalThis.$fetch
    useRouter().afterEach(() => void connection.check())
  },
})
