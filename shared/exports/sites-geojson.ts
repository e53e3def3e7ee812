// An organisation's sites for GIS, as GeoJSON (RFC 7946): a FeatureCollection of Points whose
// coordinates are [longitude, latitude] in WGS 84 (the only CRS RFC 7946 allows, so no "crs"
// member), with each site's headline under its planning scenario. Heights are metres above the
// site's datum, named beside them; a site without an outlook of that scenario has null figures.

export interface GeoSite {
  id: string
  name: string
  latitude: number
  longitude: number
  referenceLevel: string
  referenceEpoch: number
  planningScenario: string
  planningTolerance: number
}

export interface GeoOutlook {
  id: string
  inputHash: string
  finishedAt: Date | null
  headline: {
    thresholdLabel: string
    height: number
    year: number
    probability: number
    triggerYears?: Array<{ tolerance: number, year: number | null }>
  } | null
}

/** RFC 7946 §11.2: six decimals (about 10 cm) are more than enough. */
const coordinate = (degrees: number) => Math.round(degrees * 1e6) / 1e6

export function sitesGeoJson(rows: { site: GeoSite, outlook: GeoOutlook | null }[]) {
  return {
    type: 'FeatureCollection' as const,
    features: rows.map(({ site, outlook }) => {
      const headline = outlook?.headline ?? null
      const trigger = headline?.triggerYears?.find(t => Math.abs(t.tolerance - site.planningTolerance) < 1e-9)
      return {
        type: 'Feature' as const,
        id: site.id,
        geometry: { type: 'Point' as const, coordinates: [coordinate(site.longitude), coordinate(site.latitude)] },
        properties: {
          name: site.name,
          planningScenario: site.planningScenario,
          planningTolerance: site.planningTolerance,
          datum: site.referenceLevel,
          referenceEpoch: site.referenceEpoch,
          headlineThreshold: headline?.thresholdLabel ?? null,
          headlineHeightAboveDatumM: headline ? Math.round(headline.height * 1000) / 1000 : null,
          headlineYear: headline?.year ?? null,
          headlineChance: headline ? Math.round(headline.probability * 1e4) / 1e4 : null,
          /**
           * The first year the headline threshold's chance reaches the planning tolerance (null: not by the last year,
           * or not stored).
           */
          triggerYearAtTolerance: trigger?.year ?? null,
          outlookId: outlook?.id ?? null,
          inputHash: outlook?.inputHash ?? null,
          computedAt: outlook?.finishedAt ? new Date(outlook.finishedAt).toISOString() : null,
          caution: 'Projections, not predictions; see the assumptions and cautions in a briefing.',
        },
      }
    }),
  }
}
