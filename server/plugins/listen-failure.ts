/**
 * A server that cannot take its port (already in use, or not allowed) stops with a clear message
 * and a non-zero exit, so a supervisor sees the failure and restarts or reports it. Without this
 * Nitro logs the error as an uncaught exception and the process lives on, serving nothing.
 */
export default defineNitroPlugin(() => {
  process.on('uncaughtException', (error: NodeJS.ErrnoException & { port?: number }) => {
    if (error.syscall !== 'listen') return
    console.error(`Chargewell cannot listen on port ${error.port}: ${error.code}. `
      + 'Stop whatever holds the port, or set PORT to another one.')
    process.exit(1)
  })
})
