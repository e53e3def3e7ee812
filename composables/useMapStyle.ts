import type { StyleSpecification } from 'maplibre-gl'

/** Where the map opens: the invented island of Caldwyn, in the open North Atlantic (west, south, east, north). */
export const CALDWYN_BOUNDS: [number, number, number, number] = [-36.1, 46.6, -31.75, 49.4]
/** Zoom for a single site being placed or moved: the island and its neighbourhood stay in view. */
export const PIN_ZOOM = 6

/**
 * The app's own map style (server/routes/map/style.json.get.ts), with its relative URLs made
 * absolute for the map's worker and the island's label in the reader's language.
 */
export function useMapStyle() {
  const { t } = useI18n()
  return async (): Promise<StyleSpecification> => {
    const style = await $fetch<StyleSpecification & { 'font-faces'?: Record<string, string> }>('/map/style.json')
    const absolute = (path: string) => new URL(path, window.location.origin).href
    for (const source of Object.values(style.sources)) {
      if ('data' in source && typeof source.data === 'string') source.data = absolute(source.data)
    }
    for (const [name, file] of Object.entries(style['font-faces'] ?? {})) style['font-faces']![name] = absolute(file)
    const label = style.layers.find(layer => layer.id === 'caldwyn-label')
    if (label && label.type === 'symbol') label.layout = { ...label.layout, 'text-field': t('map.islandLabel') }
    return style
  }
}

/** MapLibre's own control labels, in the reader's language. */
export function useMapLocale() {
  const { t } = useI18n()
  return (title: string) => ({
    'Map.Title': title,
    'NavigationControl.ZoomIn': t('map.zoomIn'),
    'NavigationControl.ZoomOut': t('map.zoomOut'),
    'NavigationControl.ResetBearing': t('map.resetNorth'),
    'AttributionControl.ToggleAttribution': t('map.toggleAttribution'),
  })
}
