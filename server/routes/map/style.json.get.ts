// The map's style, served by the app so the browser needs nothing from elsewhere: land from
// /map/land.json, the invented island from /map/caldwyn.geojson, and labels drawn with the app's
// own font through `font-faces` (no glyph server, no tiles, no sprites). URLs are relative to the
// site; the client resolves them against its own origin before handing the style to the map.

const MAP_FONT = 'Atkinson Hyperlegible Regular'
const FONT_FILE = '/fonts/atkinson-hyperlegible-latin-400-normal.woff'

// The app's palette (tailwind.config.ts): brine for water, dune for land, abyss for ink.
const SEA = '#d5eef3'
const LAND = '#f2eee3'
const COAST = '#1f6f86'
const ISLAND = '#e4dcc7'
const INK = '#0b1a23'

const style = {
  'version': 8,
  'name': 'Brinkwater coast',
  'font-faces': { [MAP_FONT]: FONT_FILE },
  'sources': {
    land: {
      type: 'geojson',
      data: '/map/land.json',
      attribution: 'Land: Natural Earth 1:50m (public domain) via world-atlas',
    },
    caldwyn: { type: 'geojson', data: '/map/caldwyn.geojson' },
  },
  'layers': [
    { id: 'sea', type: 'background', paint: { 'background-color': SEA } },
    { id: 'land', type: 'fill', source: 'land', paint: { 'fill-color': LAND } },
    { id: 'coast', type: 'line', source: 'land', paint: { 'line-color': COAST, 'line-width': 0.8 } },
    {
      id: 'caldwyn-land',
      type: 'fill',
      source: 'caldwyn',
      filter: ['==', ['geometry-type'], 'Polygon'],
      paint: { 'fill-color': ISLAND },
    },
    {
      id: 'caldwyn-coast',
      type: 'line',
      source: 'caldwyn',
      filter: ['==', ['geometry-type'], 'Polygon'],
      paint: { 'line-color': COAST, 'line-width': 1.4 },
    },
    {
      id: 'caldwyn-label',
      type: 'symbol',
      source: 'caldwyn',
      filter: ['==', ['get', 'role'], 'label'],
      layout: {
        'text-field': 'Caldwyn (illustrative)',
        'text-font': [MAP_FONT],
        'text-size': 15,
        'text-letter-spacing': 0.05,
      },
      paint: { 'text-color': INK, 'text-halo-color': ISLAND, 'text-halo-width': 1.5 },
    },
  ],
}

export default defineEventHandler((event) => {
  setResponseHeaders(event, { 'cache-control': 'public, max-age=3600' })
  return style
})
