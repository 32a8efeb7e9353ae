import type { ToolBody } from '#shared/schemas/tools'
import type { ToolDto } from '#shared/types/registers'
import { useFieldReferenceStore } from '~~/stores/field-reference'

/** The tool register, filtered, sorted and paged on the server. */
export function useToolRegister(filters: Record<string, unknown>) {
  return useRegisterList<ToolDto>('/api/tools', 'tool-register', filters, 'assetNumber')
}

/** One tool and its calibration; a recorded calibration is read back from the server. */
export async function useTool(id: number) {
  const tool = await useFetch<ToolDto>(`/api/tools/${id}`, { key: `tool-${id}` })
  async function recordCalibration(calibrationDue: string) {
    await setCalibrationDue(id, calibrationDue)
    await tool.refresh()
  }
  return { ...tool, recordCalibration }
}

/** Records a calibration: the date the next one is due. */
export function setCalibrationDue(id: number, calibrationDue: string) {
  return $fetch<ToolDto>(`/api/tools/${id}`, { method: 'PATCH', body: { calibrationDue } })
}

/** Adds a gauge or a nitrogen cart to the register. */
export function addTool(body: ToolBody) {
  return $fetch<ToolDto>('/api/tools', { method: 'POST', body })
}

/**
 * The tools in service, for a worksheet's tool step. With no signal (nothing fetched), the tools this device
 * keeps in its station copy, their calibration judged by today's date at the station.
 */
export function useToolsInService() {
  const reference = useFieldReferenceStore()
  const { data, status, error } = useFetch('/api/tools', {
    key: 'tools-active',
    query: { active: 'true', pageSize: 500 },
    transform: (answer: { items: ToolDto[] }) => answer.items,
  })
  const tools = computed(() => data.value ?? reference.reference?.tools ?? null)
  return { tools, status, error: computed(() => tools.value ? null : error.value) }
}
