import type { Language } from '../wording/chance'

// The fixed words of a briefing document, in each language a briefing can be issued in. The page
// and the PDF both read them from here, so the two always say the same thing.

/** One chance, said as the number and the calibrated word; in Spanish also after "de" and "a". */
export interface ChanceSaid { plain: string, afterDe: string, afterA: string }
export interface ScenarioChance { scenario: string, chance: ChanceSaid }

export interface BriefingText {
  documentKind: string
  sections: { summary: string, charts: string, table: string, basis: string, cautions: string, provenance: string, context: string }
  summaryIntro: (site: string, scenario: string) => string
  rangeSentence: (year: number, median: string, low: string, high: string, epoch: number) => string
  /** The summary's findings, one sentence each: the key threshold, its trigger year, the spread over scenarios. */
  keyThreshold: (scenario: string, site: string, threshold: string, height: string, chances: { chance: ChanceSaid, year: number }[]) => string
  keyFlood: (scenario: string, threshold: string, sentence: string) => string
  trigger: (threshold: string, tolerance: string, year: number) => string
  noTrigger: (threshold: string, tolerance: string, lastYear: number) => string
  spread: (count: number, year: number, low: ScenarioChance, high: ScenarioChance) => string
  spreadSame: (count: number, year: number, chance: ChanceSaid) => string
  gridCaption: (scenario: string, withFlood: boolean) => string
  gridThreshold: string
  /** For the engineer: one sentence per mean-sea-level threshold, every chosen year in it. */
  detailTitle: string
  detailLine: (threshold: string, height: string, chances: { chance: ChanceSaid, year: number }[]) => string
  heights: (unit: string, datum: string) => string
  unitNames: Record<string, string>
  issuedBy: (organisation: string, author: string | null) => string
  /** A flood level's line starts with its name and height; the sentence comes from wording/flood. */
  floodLine: (threshold: string, height: string, sentence: string) => string
  datum: (name: string, kind: string, offset: string, epoch: number) => string
  datumKinds: Record<string, string>
  measures: { meanSeaLevel: string, flood: string }
  chartExceedance: string
  chartExceedanceAxis: { x: string, y: string }
  chartFan: string
  chartFanLegend: { median: string, likely: string, veryLikely: string, extreme: string }
  tableHead: { scenario: string, threshold: string, measure: string }
  extremesTitle: string
  extremesHead: { year: string, allowance: string, expected: (today: number) => string, chance: string }
  extremesNote: string
  storylines: { title: string, intro: string, line: (level: string, reference: string, year: number, rise: string, epoch: number, p95: string) => string, source: (organisation: string, version: number, citation: string) => string, illustrative: string }
  /** Beside an allowance that a heavy-tailed release leaves unbounded. */
  unsettled: string
  basisHead: { component: string, scenario: string, version: string, citation: string, state: string, scale: string }
  landMotion: (rate: string, sigma: string, source: string, epoch: number, reference: string) => string
  sampling: (samples: string, seed: number) => string
  method: string[]
  cautions: string[]
  highEnd: string
  provenance: { issued: string, version: string, inputHash: string, link: string, audience: string, previous: string, organisation: string, author: string, signIn: (organisation: string) => string }
  draftMark: string
  illustrative: string
  page: (current: number, total: number) => string
  notes: { unscaled: (scenario: string, components: string) => string, correlated: (scenario: string) => string, uncorrelated: (scenario: string) => string }
  components: Record<string, string>
  states: Record<string, string>
  sources: Record<string, string>
}

const en: BriefingText = {
  documentKind: 'Sea-level briefing',
  sections: { summary: 'Summary', charts: 'Charts', table: 'Chances by year', basis: 'What this rests on', cautions: 'What this is not', provenance: 'About this document', context: 'Local context' },
  summaryIntro: (site, scenario) => `How high the sea may rise at ${site} under the ${scenario} scenario, counting the land's own sinking or uplift.`,
  rangeSentence: (year, median, low, high, epoch) => `Between ${epoch} and ${year} the middle estimate of the rise is ${median}; it is likely (two chances in three) to lie between ${low} and ${high}.`,
  keyThreshold: (scenario, site, threshold, height, chances) => `Under ${scenario}, the chance that the mean sea level at ${site} rises above “${threshold}” (${height}) is ${new Intl.ListFormat('en-GB').format(chances.map(c => `${c.chance.plain} by ${c.year}`))}.`,
  keyFlood: (scenario, threshold, sentence) => `Under ${scenario}, at the flood level “${threshold}”: ${sentence}`,
  trigger: (threshold, tolerance, year) => `The chance of passing “${threshold}” reaches ${tolerance}, the chance this briefing plans to, in ${year}: its trigger year.`,
  noTrigger: (threshold, tolerance, lastYear) => `The chance of passing “${threshold}” stays below ${tolerance}, the chance this briefing plans to, up to ${lastYear}, the last year computed.`,
  spread: (count, year, low, high) => `Across the ${count} scenarios compared, that chance by ${year} runs from ${low.chance.plain} under ${low.scenario} to ${high.chance.plain} under ${high.scenario}.`,
  spreadSame: (count, year, chance) => `Across the ${count} scenarios compared, that chance by ${year} is ${chance.plain} under each.`,
  gridCaption: (scenario, withFlood) => `Chance under ${scenario} that the mean sea level is above each threshold by each year${withFlood ? '; for a flood level, the chance that the water reaches it in that year' : ''}.`,
  gridThreshold: 'Threshold',
  detailTitle: 'Each threshold in detail',
  detailLine: (threshold, height, chances) => `“${threshold}” (${height}): the chance that the mean sea level here is above it is ${new Intl.ListFormat('en-GB').format(chances.map(c => `${c.chance.plain} by ${c.year}`))}.`,
  heights: (unit, datum) => `Heights in ${unit} above ${datum}.`,
  unitNames: { m: 'metres', ft: 'feet' },
  issuedBy: (organisation, author) => author ? `Issued by ${organisation} · ${author}` : `Issued by ${organisation}`,
  floodLine: (threshold, height, sentence) => `${threshold} (flood level, ${height}): ${sentence}`,
  datum: (name, kind, offset, epoch) => `Heights are above ${name} (${kind}); mean sea level stood ${offset} above it in ${epoch}, the year every rise here is counted from. The rise already expected between ${epoch} and today is part of every chance.`,
  datumKinds: { 'mean-sea-level': 'mean sea level at an epoch', 'land-survey': 'a land survey datum', 'chart': 'a chart datum' },
  measures: { meanSeaLevel: 'Mean sea level above it by that year', flood: 'Flood level: the water reaches it in that year' },
  chartExceedance: 'Chance that the rise exceeds each height',
  chartExceedanceAxis: { x: 'Rise of mean sea level since the reference epoch', y: 'Chance of exceeding' },
  chartFan: 'Rise over time: middle estimate and ranges',
  chartFanLegend: { median: 'Middle estimate', likely: 'Likely range (17–83 %)', veryLikely: 'Very likely range (5–95 %)', extreme: '1–99 %' },
  tableHead: { scenario: 'Scenario', threshold: 'Threshold', measure: 'Chance of' },
  extremesTitle: 'Flood allowance and frequency',
  storylines: {
    title: 'High-end storylines',
    intro: 'A storyline is a named case a science group considers plausible, such as an early collapse of part of an ice sheet. It has no probability and is not part of the chances above, which come from the releases alone: read it as "if this happened".',
    line: (level, reference, year, rise, epoch, p95) => `If this storyline happened, the mean sea level here would be ${level} above ${reference} by ${year} (a rise of ${rise} since ${epoch}); the outlook puts a 5 % chance on a rise above ${p95} by then.`,
    source: (organisation, version, citation) => `Published by ${organisation}, version ${version}: ${citation}`,
    illustrative: 'illustrative',
  },
  extremesHead: { year: 'Year', allowance: 'Allowance', expected: today => `Today's ${today}-year level is expected`, chance: 'Chance in any one year' },
  extremesNote: 'The allowance is how much to raise an asset so that the expected number of floods stays as it is today. Without it, floods become more frequent: the multiple counts expected floods, while the chance of at least one flood in a year grows less and is shown beside it.',
  unsettled: 'not a settled value: a release\'s heavy tail is capped at its 99.9th percentile',
  basisHead: { component: 'Source of rise', scenario: 'Scenario', version: 'Version', citation: 'Citation', state: 'State', scale: 'Scale factor' },
  landMotion: (rate, sigma, source, epoch, reference) => `Land motion: ${rate} ± ${sigma} per year (negative means the land sinks, which adds to the rise), from ${source}, reference year ${epoch}. ${reference}`,
  sampling: (samples, seed) => `Computed from ${samples} Monte Carlo samples with seed ${seed}; the same inputs and seed give the same numbers.`,
  method: [
    'Each source of rise is taken from its latest published, reviewed release and sampled together with the others and with the land motion, many thousands of times; how the sources were tied to one another is stated above, scenario by scenario.',
    'For a mean-sea-level threshold, the chance is the share of those samples in which the local rise of the mean sea exceeds it; the ranges are their percentiles.',
    'For a flood level, each sample\'s rise is added to the site\'s annual maximum water levels (a Gumbel distribution fitted to the local record): the chance in a year is the average over the samples of the chance that the year\'s highest water reaches the level, and the chance over an asset\'s life counts every year of that life.',
  ],
  cautions: [
    'Projections are not predictions. They depend on the releases and assumptions listed here and will change as the science does.',
    'Deep uncertainty in how the ice sheets will behave can take the rise beyond these ranges.',
    'This briefing is not engineering or legal advice. Design and permits follow local codes and standards and the judgement of licensed coastal engineers.',
  ],
  highEnd: 'Low-likelihood, high-impact outcomes from ice-sheet instability — a rise approaching 2 m by 2100 — cannot be ruled out and are worth a separate storyline for long-lived assets.',
  provenance: { issued: 'Issued', version: 'Version', inputHash: 'Input hash', link: 'Live page', audience: 'Prepared for', previous: 'Replaces version', organisation: 'Issued by', author: 'Author', signIn: organisation => `Opens only after signing in${organisation ? ` with an account of ${organisation}` : ''}.` },
  draftMark: 'DRAFT — not issued',
  illustrative: 'Illustrative demo data: the places, organisations and numbers are invented.',
  page: (current, total) => `Page ${current} of ${total}`,
  notes: {
    unscaled: (scenario, components) => `${scenario}: no published scale factors cover this site for ${components}; their global-mean rise was used as it is (factor 1.0).`,
    correlated: scenario => `${scenario}: the sources were sampled with the correlations published for this scenario.`,
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
  rangeSentence: (year, median, low, high, epoch) => `Entre ${epoch} y ${year} la estimación central de la subida es ${median}; es probable (dos de cada tres posibilidades) que esté entre ${low} y ${high}.`,
  keyThreshold: (scenario, site, threshold, height, chances) => `En el escenario ${scenario}, la probabilidad de que el nivel medio del mar en ${site} supere «${threshold}» (${height}) es ${new Intl.ListFormat('es').format(chances.map(c => `${c.chance.afterDe} para ${c.year}`))}.`,
  keyFlood: (scenario, threshold, sentence) => `En el escenario ${scenario}, para la cota de inundación «${threshold}»: ${sentence}`,
  trigger: (threshold, tolerance, year) => `La probabilidad de superar «${threshold}» alcanza el ${tolerance}, la probabilidad con la que planifica este informe, en ${year}: es su año de activación.`,
  noTrigger: (threshold, tolerance, lastYear) => `La probabilidad de superar «${threshold}» se mantiene por debajo del ${tolerance}, la probabilidad con la que planifica este informe, hasta ${lastYear}, el último año calculado.`,
  spread: (count, year, low, high) => `En los ${count} escenarios comparados, esa probabilidad para ${year} va ${low.chance.afterDe} con ${low.scenario} ${high.chance.afterA} con ${high.scenario}.`,
  spreadSame: (count, year, chance) => `En los ${count} escenarios comparados, esa probabilidad para ${year} es ${chance.afterDe} en todos.`,
  gridCaption: (scenario, withFlood) => `Probabilidad, en el escenario ${scenario}, de que el nivel medio del mar supere cada umbral en cada año${withFlood ? '; para una cota de inundación, la probabilidad de que el agua la alcance en ese año' : ''}.`,
  gridThreshold: 'Umbral',
  detailTitle: 'Cada umbral en detalle',
  detailLine: (threshold, height, chances) => `«${threshold}» (${height}): la probabilidad de que el nivel medio del mar aquí lo supere es ${new Intl.ListFormat('es').format(chances.map(c => `${c.chance.afterDe} para ${c.year}`))}.`,
  heights: (unit, datum) => `Alturas en ${unit} sobre ${datum}.`,
  unitNames: { m: 'metros', ft: 'pies' },
  issuedBy: (organisation, author) => author ? `Emitido por ${organisation} · ${author}` : `Emitido por ${organisation}`,
  floodLine: (threshold, height, sentence) => `${threshold} (cota de inundación, ${height}): ${sentence}`,
  datum: (name, kind, offset, epoch) => `Las alturas se miden sobre ${name} (${kind}); el nivel medio del mar estaba ${offset} por encima en ${epoch}, el año desde el que se cuenta toda subida aquí. La subida ya esperada entre ${epoch} y hoy forma parte de cada probabilidad.`,
  datumKinds: { 'mean-sea-level': 'nivel medio del mar en una época', 'land-survey': 'un datum de nivelación terrestre', 'chart': 'un cero hidrográfico' },
  measures: { meanSeaLevel: 'Nivel medio del mar por encima en ese año', flood: 'Cota de inundación: el agua la alcanza en ese año' },
  chartExceedance: 'Probabilidad de que la subida supere cada altura',
  chartExceedanceAxis: { x: 'Subida del nivel medio del mar desde la época de referencia', y: 'Probabilidad de superarla' },
  chartFan: 'Subida a lo largo del tiempo: estimación central y rangos',
  chartFanLegend: { median: 'Estimación central', likely: 'Rango probable (17–83 %)', veryLikely: 'Rango muy probable (5–95 %)', extreme: '1–99 %' },
  tableHead: { scenario: 'Escenario', threshold: 'Umbral', measure: 'Probabilidad de' },
  extremesTitle: 'Margen de inundación y frecuencia',
  storylines: {
    title: 'Escenarios extremos',
    intro: 'Un escenario extremo es un caso concreto que un grupo científico considera plausible, como el colapso temprano de parte de un manto de hielo. No tiene probabilidad y no forma parte de las probabilidades anteriores, que salen solo de las versiones publicadas: léalo como «si esto ocurriera».',
    line: (level, reference, year, rise, epoch, p95) => `Si este escenario ocurriera, el nivel medio del mar aquí estaría ${level} por encima de ${reference} en ${year} (una subida de ${rise} desde ${epoch}); la perspectiva da una probabilidad del 5 % a una subida de más de ${p95} para entonces.`,
    source: (organisation, version, citation) => `Publicado por ${organisation}, versión ${version}: ${citation}`,
    illustrative: 'ilustrativo',
  },
  extremesHead: { year: 'Año', allowance: 'Margen', expected: today => `El nivel de ${today} años de hoy se espera`, chance: 'Probabilidad en un año cualquiera' },
  extremesNote: 'El margen es cuánto elevar una infraestructura para que el número esperado de inundaciones siga como hoy. Sin él, las inundaciones se vuelven más frecuentes: el múltiplo cuenta inundaciones esperadas, mientras que la probabilidad de al menos una inundación en un año crece menos y se muestra al lado.',
  unsettled: 'no es un valor estable: la cola larga de una versión se limita a su percentil 99,9',
  basisHead: { component: 'Fuente de subida', scenario: 'Escenario', version: 'Versión', citation: 'Cita', state: 'Estado', scale: 'Factor de escala' },
  landMotion: (rate, sigma, source, epoch, reference) => `Movimiento del terreno: ${rate} ± ${sigma} al año (negativo significa que el terreno se hunde, lo que suma a la subida), según ${source}, año de referencia ${epoch}. ${reference}`,
  sampling: (samples, seed) => `Calculado con ${samples} muestras de Monte Carlo y semilla ${seed}; los mismos datos y semilla dan las mismas cifras.`,
  method: [
    'Cada fuente de subida se toma de su última versión publicada y revisada y se muestrea junto con las demás y con el movimiento del terreno, muchos miles de veces; cómo se relacionan las fuentes entre sí se indica más arriba, escenario por escenario.',
    'Para un umbral del nivel medio, la probabilidad es la proporción de esas muestras en las que la subida local del nivel medio lo supera; los rangos son sus percentiles.',
    'Para una cota de inundación, la subida de cada muestra se suma a los niveles máximos anuales del sitio (una distribución de Gumbel ajustada al registro local): la probabilidad en un año es la media, sobre las muestras, de la probabilidad de que el agua más alta del año alcance la cota, y la probabilidad durante la vida útil cuenta cada año de esa vida.',
  ],
  cautions: [
    'Las proyecciones no son predicciones. Dependen de las versiones y los supuestos aquí indicados y cambiarán con la ciencia.',
    'La profunda incertidumbre sobre el comportamiento de los mantos de hielo puede llevar la subida más allá de estos rangos.',
    'Este informe no es asesoramiento de ingeniería ni jurídico. El diseño y los permisos siguen las normas y códigos locales y el criterio de ingenieros costeros colegiados.',
  ],
  highEnd: 'No pueden descartarse resultados poco probables y de gran impacto por inestabilidad de los mantos de hielo — una subida cercana a 2 m en 2100 —, que merecen un escenario aparte para infraestructuras de larga vida.',
  provenance: { issued: 'Emitido', version: 'Versión', inputHash: 'Huella de los datos', link: 'Página en línea', audience: 'Preparado para', previous: 'Sustituye a la versión', organisation: 'Emitido por', author: 'Autoría', signIn: organisation => `Solo se abre tras iniciar sesión${organisation ? ` con una cuenta de ${organisation}` : ''}.` },
  draftMark: 'BORRADOR — no emitido',
  illustrative: 'Datos ilustrativos de demostración: los lugares, organizaciones y cifras son inventados.',
  page: (current, total) => `Página ${current} de ${total}`,
  notes: {
    unscaled: (scenario, components) => `${scenario}: ningún factor de escala publicado cubre este sitio para ${components}; se usó su subida media global tal cual (factor 1,0).`,
    correlated: scenario => `${scenario}: las fuentes se muestrearon con las correlaciones publicadas para este escenario.`,
    uncorrelated: scenario => `${scenario}: no se ha publicado ninguna correlación entre las fuentes, así que se muestrearon como independientes.`,
  },
  components: { 'ocean-expansion': 'Calentamiento del océano', 'glaciers': 'Glaciares', 'greenland': 'Manto de hielo de Groenlandia', 'antarctica': 'Manto de hielo antártico', 'land-water': 'Agua terrestre', 'regional-ocean': 'Océano regional', 'other': 'Otras', 'land-motion': 'Movimiento del terreno' },
  states: { published: 'publicada', superseded: 'sustituida', withdrawn: 'retirada' },
  sources: { gps: 'una estación GPS', insar: 'radar por satélite (InSAR)', model: 'un modelo', other: 'otra fuente' },
}

export const BRIEFING_TEXT: Record<Language, BriefingText> = { en, es }
