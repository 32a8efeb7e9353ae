/** Pump cycle interval and leak rate per aircraft system, against the system's own baseline. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  await evaluateTrendAlerts()
  return { items: await fleetCycleTrends(), dropShare: Number(useRuntimeConfig().cycleDropShare) }
})
