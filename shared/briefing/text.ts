import type { Language } from '../wording/chance'

// The fixed words of a briefing document, in each language a briefing can be issued in. The page
// and the PDF both read them from here, so the two always say the same thing.

export interface BriefingText {
  documentKind: string
  sections: { summary: string, charts: string, table: string, basis: string, cautions: string, provenance: string, context: string }
  summaryIntro: (site: string, scenario: string) => string
  rangeSentence: (year: number, median: string, low: string, high: string) => string
  chanceLine: (odds: string, chance: string, word: string, height: string, threshold: string, year: number) => string
  chartExceedance: string
  chartExceedanceAxis: { x: string, y: string }
  chartFan: string
  chartFanLegend: { median: string, likely: string, veryLikely: string, extreme: string }
  tableHead: { scenario: string, threshold: string }
  extremesTitle: string
  extremesHead: { year: string, allowance: string, amplification: string }
  extremesNote: string
  basisHead: { component: string, scenario: string, version: string, citation: string, state: string, scale: string }
  landMotion: (rate: string, sigma: string, source: string, epoch: number, reference: string) => string
  sampling: (samples: string, seed: number) => string
  method: string[]
  cautions: string[]
  highEnd: string
  provenance: { issued: string, version: string, inputHash: string, link: string, audience: string, previous: string }
  draftMark: string
  illustrative: string
  page: (current: number, total: number) => string
  notes: { unscaled: (scenario: string, components: string) => string, uncorrelated: (scenario: string) => string }
  components: Record<string, string>
  states: Record<string, string>
  sources: Record<string, string>
}

const en: BriefingText = {
  documentKind: 'Sea-level briefing',
  sections: { summary: 'Summary', charts: 'Charts', table: 'Chances by year', basis: 'What this rests on', cautions: 'What this is not', provenance: 'About this document', context: 'Local context' },
  summaryIntro: (site, scenario) => `How high the sea may rise at ${site} under the ${scenario} scenario, counting the land's own sinking or uplift.`,
  rangeSentence: (year, median, low, high) => `By ${year} the middle estimate of the rise is ${median}; it is likely (two chances in three) to lie between ${low} and ${high}.`,
  chanceLine: (odds, chance, word, height, threshold, year) => `${threshold} (${height}): ${odds} — ${chance}, ${word} — that the sea is higher than this by ${year}.`,
  chartExceedance: 'Chance that the rise exceeds each height',
  chartExceedanceAxis: { x: 'Rise above the reference level', y: 'Chance of exceeding' },
  chartFan: 'Rise over time: middle estimate and ranges',
  chartFanLegend: { median: 'Middle estimate', likely: 'Likely range (17–83 %)', veryLikely: 'Very likely range (5–95 %)', extreme: '1–99 %' },
  tableHead: { scenario: 'Scenario', threshold: 'Threshold' },
  extremesTitle: 'Flood allowance and frequency',
  extremesHead: { year: 'Year', allowance: 'Allowance', amplification: 'Floods more often (×)' },
  extremesNote: 'The allowance is how much to raise an asset so that the expected number of floods stays as it is today; the second column is how many times more often today\'s floods would be expected.',
  basisHead: { component: 'Source of rise', scenario: 'Scenario', version: 'Version', citation: 'Citation', state: 'State', scale: 'Scale factor' },
  landMotion: (rate, sigma, source, epoch, reference) => `Land motion: ${rate} ± ${sigma} per year (negative means the land sinks, which adds to the rise), from ${source}, reference year ${epoch}. ${reference}`,
  sampling: (samples, seed) => `Computed from ${samples} Monte Carlo samples with seed ${seed}; the same inputs and seed give the same numbers.`,
  method: [
    'Each source of rise is taken from its latest published, reviewed release and sampled together with the others (keeping their published correlations) and with the land motion, many thousands of times.',
    'The chances above are the share of those samples in which the local rise exceeds each height; the ranges are their percentiles.',
  ],
  cautions: [
    'Projections are not predictions. They depend on the releases and assumptions listed here and will change as the science does.',
    'Deep uncertainty in how the ice sheets will behave can take the rise beyond these ranges.',
    'This briefing is not engineering or legal advice. Design and permits follow local codes and standards and the judgement of licensed coastal engineers.',
  ],
  highEnd: 'Low-likelihood, high-impact outcomes from ice-sheet instability — a rise approaching 2 m by 2100 — cannot be ruled out and are worth a separate storyline for long-lived assets.',
  provenance: { issued: 'Issued', version: 'Version', inputHash: 'Input hash', link: 'Live page', audience: 'Prepared for', previous: 'Replaces version' },
  draftMark: 'DRAFT — not issued',
  illustrative: 'Illustrative demo data: the places, organisations and numbers are invented.',
  page: (current, total) => `Page ${current} of ${total}`,
  notes: {
    unscaled: (scenario, components) => `${scenario}: no published scale factors cover this site for ${components}; their global-mean rise was used as it is (factor 1.0).`,
    uncorrelated: scenario => `${scenario}: no correlation between the sources has been published, so they were sampled as independent.`,
  },
  components: { 'ocean-expansion': 'Ocean warming', 'glaciers': 'Glaciers', 'greenland': 'Greenland ice sheet', 'antarctica': 'Antarctic ice sheet', 'land-water': 'Land water', 'regional-ocean': 'Regional ocean', 'other': 'Other', 'land-motion': 'Land motion' },
  states: { published: 'published', superseded: 'superseded', withdrawn: 'withdrawn' },
  sources: { gps: 'a GPS station', insar: 'satellite radar (InSAR)', model: 'a model', other: 'another source' },
}

const es: BriefingText = {
  documentKind: 'Informe sobre el nivel del mar',
  sections: { summary: 'Resumen', charts: 'Gráficos', table: 'Probabilidades por año', basis: 'En qué se basa', cautions: 'Lo que este informe no es', provenance: 'Sobre este documento', context: 'Contexto local' },
  summaryIntro: (site, scenario) => `Cuánto puede subir el mar en ${site} en el escenario ${scenario}, contando el hundimiento o levantamiento del propio terreno.`,
  rangeSentence: (year, median, low, high) => `En ${year} la estimación central de la subida es ${median}; es probable (dos de cada tres posibilidades) que esté entre ${low} y ${high}.`,
  chanceLine: (odds, chance, word, height, threshold, year) => `${threshold} (${height}): ${odds} — ${chance}, ${word} — de que el mar esté por encima en ${year}.`,
  chartExceedance: 'Probabilidad de que la subida supere cada altura',
  chartExceedanceAxis: { x: 'Subida sobre el nivel de referencia', y: 'Probabilidad de superarla' },
  chartFan: 'Subida a lo largo del tiempo: estimación central y rangos',
  chartFanLegend: { median: 'Estimación central', likely: 'Rango probable (17–83 %)', veryLikely: 'Rango muy probable (5–95 %)', extreme: '1–99 %' },
  tableHead: { scenario: 'Escenario', threshold: 'Umbral' },
  extremesTitle: 'Margen de inundación y frecuencia',
  extremesHead: { year: 'Año', allowance: 'Margen', amplification: 'Inundaciones más frecuentes (×)' },
  extremesNote: 'El margen es cuánto elevar una infraestructura para que el número esperado de inundaciones siga como hoy; la segunda columna indica cuántas veces más a menudo se esperarían las inundaciones de hoy.',
  basisHead: { component: 'Fuente de subida', scenario: 'Escenario', version: 'Versión', citation: 'Cita', state: 'Estado', scale: 'Factor de escala' },
  landMotion: (rate, sigma, source, epoch, reference) => `Movimiento del terreno: ${rate} ± ${sigma} al año (negativo significa que el terreno se hunde, lo que suma a la subida), según ${source}, año de referencia ${epoch}. ${reference}`,
  sampling: (samples, seed) => `Calculado con ${samples} muestras de Monte Carlo y semilla ${seed}; los mismos datos y semilla dan las mismas cifras.`,
  method: [
    'Cada fuente de subida se toma de su última versión publicada y revisada y se muestrea junto con las demás (respetando sus correlaciones publicadas) y con el movimiento del terreno, muchos miles de veces.',
    'Las probabilidades son la proporción de esas muestras en las que la subida local supera cada altura; los rangos son sus percentiles.',
  ],
  cautions: [
    'Las proyecciones no son predicciones. Dependen de las versiones y los supuestos aquí indicados y cambiarán con la ciencia.',
    'La profunda incertidumbre sobre el comportamiento de los mantos de hielo puede llevar la subida más allá de estos rangos.',
    'Este informe no es asesoramiento de ingeniería ni jurídico. El diseño y los permisos siguen las normas y códigos locales y el criterio de ingenieros costeros colegiados.',
  ],
  highEnd: 'No pueden descartarse resultados poco probables y de gran impacto por inestabilidad de los mantos de hielo — una subida cercana a 2 m en 2100 —, que merecen un escenario aparte para infraestructuras de larga vida.',
  provenance: { issued: 'Emitido', version: 'Versión', inputHash: 'Huella de los datos', link: 'Página en línea', audience: 'Preparado para', previous: 'Sustituye a la versión' },
  draftMark: 'BORRADOR — no emitido',
  illustrative: 'Datos ilustrativos de demostración: los lugares, organizaciones y cifras son inventados.',
  page: (current, total) => `Página ${current} de ${total}`,
  notes: {
    unscaled: (scenario, components) => `${scenario}: ningún factor de escala publicado cubre este sitio para ${components}; se usó su subida media global tal cual (factor 1,0).`,
    uncorrelated: scenario => `${scenario}: no se ha publicado ninguna correlación entre las fuentes, así que se muestrearon como independientes.`,
  },
  components: { 'ocean-expansion': 'Calentamiento del océano', 'glaciers': 'Glaciares', 'greenland': 'Manto de hielo de Groenlandia', 'antarctica': 'Manto de hielo antártico', 'land-water': 'Agua terrestre', 'regional-ocean': 'Océano regional', 'other': 'Otras', 'land-motion': 'Movimiento del terreno' },
  states: { published: 'publicada', superseded: 'sustituida', withdrawn: 'retirada' },
  sources: { gps: 'una estación GPS', insar: 'radar por satélite (InSAR)', model: 'un modelo', other: 'otra fuente' },
}

export const BRIEFING_TEXT: Record<Language, BriefingText> = { en, es }
