import type { Ref } from 'vue'

/**
 * Which measure or pathway of the pathways page is being changed: its form takes the place of the
 * "add" form, whose heading gets the focus so a keyboard or screen reader follows the move.
 */
export function useItemEditing<M extends { id: string }, P extends { id: string }>(
  view: Ref<{ measures: M[], pathways: P[] }>,
) {
  const measureId = ref<string | null>(null)
  const pathwayId = ref<string | null>(null)
  const editedMeasure = computed(() => view.value.measures.find(m => m.id === measureId.value) ?? null)
  const editedPathway = computed(() => view.value.pathways.find(p => p.id === pathwayId.value) ?? null)
  async function focus(heading: string) {
    await nextTick()
    const element = document.getElementById(heading)
    element?.scrollIntoView({ block: 'start' })
    element?.focus()
  }
  return {
    measureId,
    pathwayId,
    editedMeasure,
    editedPathway,
    measure(id: string | null) {
      measureId.value = id
      if (id) void focus('measure-form-title')
    },
    pathway(id: string | null) {
      pathwayId.value = id
      if (id) void focus('pathway-form-title')
    },
  }
}
