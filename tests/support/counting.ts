/** How many answers had each status, e.g. { 200: 1, 409: 49 }. */
export function statusCounts(answers: { status: number }[]): Record<number, number> {
  const counts: Record<number, number> = {}
  for (const { status } of answers) counts[status] = (counts[status] ?? 0) + 1
  return counts
}
