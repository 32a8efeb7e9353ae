/** Watches the event loop from the start (see server/utils/event-loop.ts). */
export default defineNitroPlugin(() => {
  startEventLoopMonitor()
})
