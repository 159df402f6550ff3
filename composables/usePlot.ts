/**
 * The plotting library for a diagram component: loaded when the component
 * mounts (so pages without diagrams never carry it), then `render` is called,
 * and called again when the container's width changes by more than 20 px.
 */
import { onBeforeUnmount, onMounted, ref, shallowRef, type Ref } from 'vue'

export type PlotModule = typeof import('@observablehq/plot')

export function usePlot(container: Ref<HTMLElement | null>, render: () => void) {
  const plotModule = shallowRef<PlotModule | null>(null)
  const loadError = ref<string | null>(null)
  let resize: ResizeObserver | null = null
  onMounted(async () => {
    try {
      plotModule.value = await import('@observablehq/plot')
    } catch {
      loadError.value = 'The plotting code could not be loaded. Reload the page to try again.'
      return
    }
    render()
    if (typeof ResizeObserver !== 'undefined' && container.value) {
      let lastWidth = container.value.clientWidth
      resize = new ResizeObserver(() => {
        const width = container.value?.clientWidth ?? 0
        if (Math.abs(width - lastWidth) > 20) {
          lastWidth = width
          render()
        }
      })
      resize.observe(container.value)
    }
  })
  onBeforeUnmount(() => resize?.disconnect())
  return { plotModule, loadError }
}
