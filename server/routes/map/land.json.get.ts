// @ts-expect-error topojson-client ships no type declarations; the one function used is typed below.
import { feature } from 'topojson-client'
import topology from 'world-atlas/land-50m.json'

// Land for the map, from Natural Earth 1:50m as packaged by world-atlas: TopoJSON turned into
// GeoJSON once, repaired for a flat map, and kept in memory for every later request.

type Position = [number, number]
type Ring = Position[]
interface LandCollection { features: { geometry: { coordinates: Ring[][] } }[] }

const toGeoJson = feature as (topology: unknown, object: unknown) => LandCollection
/** Web Mercator cannot show the poles; a ring closed along this latitude still covers the map's edge. */
const POLE_LATITUDE = 89.9

function signedArea(ring: Ring) {
  let sum = 0
  for (let i = 0; i < ring.length - 1; i++) sum += ring[i]![0] * ring[i + 1]![1] - ring[i + 1]![0] * ring[i]![1]
  return sum / 2
}

/**
 * Longitudes made continuous along the ring, so a ring that crosses 180° runs on past it (the map's
 * GeoJSON tiler copies it to the other side) instead of jumping back across the whole world. A ring
 * that goes once round the globe (Antarctica) is closed along the pole.
 */
function unwrap(ring: Ring): Ring | null {
  if (new Set(ring.map(p => p[1])).size < 2) return null // a ring drawn along the pole line only
  const out: Ring = [[ring[0]![0], ring[0]![1]]]
  for (let i = 1; i < ring.length; i++) {
    const previous = out[i - 1]![0]
    let lon = ring[i]![0]
    while (lon - previous > 180) lon -= 360
    while (lon - previous < -180) lon += 360
    out.push([lon, ring[i]![1]])
  }
  const drift = out[out.length - 1]![0] - out[0]![0]
  if (Math.abs(drift) > 180) {
    const last = out[out.length - 1]!
    const pole = out.reduce((sum, p) => sum + p[1], 0) < 0 ? -POLE_LATITUDE : POLE_LATITUDE
    out.push([last[0], pole], [out[0]![0], pole], [out[0]![0], out[0]![1]])
  }
  // Keep most of the ring on the main world copy, whichever side of 180° the unwrapping started on.
  const lons = out.map(p => p[0])
  const shift = Math.round((Math.min(...lons) + Math.max(...lons)) / 2 / 360) * -360
  return shift ? out.map(([lon, lat]) => [lon + shift, lat]) : out
}

/** RFC 7946 winding (outer rings counter-clockwise, holes clockwise), which the map's tiler expects. */
function wind(ring: Ring, outer: boolean) {
  return (signedArea(ring) > 0) === outer ? ring : [...ring].reverse()
}

const round = (ring: Ring): Ring => ring.map(([lon, lat]) => [Math.round(lon * 1e4) / 1e4, Math.round(lat * 1e4) / 1e4])

function landGeoJson() {
  const land = toGeoJson(topology, (topology as { objects: { land: unknown } }).objects.land)
  const polygons: Ring[][] = []
  for (const polygon of land.features[0]!.geometry.coordinates) {
    const rings = polygon.map(unwrap).filter((ring): ring is Ring => ring !== null)
    if (rings.length) polygons.push(rings.map((ring, i) => round(wind(ring, i === 0))))
  }
  return JSON.stringify({ type: 'Feature', properties: {}, geometry: { type: 'MultiPolygon', coordinates: polygons } })
}

let cached: string | null = null

export default defineEventHandler((event) => {
  cached ??= landGeoJson()
  setResponseHeaders(event, { 'content-type': 'application/geo+json', 'cache-control': 'public, max-age=86400' })
  return cached
})
