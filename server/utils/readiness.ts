/**
 * Whether the server has done its start-up work (the database opened and migrated, the page renderer
 * loaded): /api/health answers 503 "starting" until then, so a load balancer, a device's connection
 * check and the test and benchmark harnesses send no one to a server that would make them wait.
 */
let ready = false

/** Runs the start-up work; the server is ready when it ends (a failed warm-up only costs time, so it is logged). */
export function startUp(work: () => Promise<void>): void {
  work()
    .catch(error => console.error('Start-up warm-up failed (the first requests will be slower):', error))
    .finally(() => (ready = true))
}

export function isReady(): boolean {
  return ready
}
