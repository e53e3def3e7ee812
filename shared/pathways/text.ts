import type { Language } from '../wording/chance'

// Fixed words of the pathways PDF and its chart, English and Spanish (the page uses locales/*-pathways.json).

export interface PathwayText {
  kind: string
  title: (site: string) => string
  illustrative: string
  intro: string
  tolerance: (percent: string) => string
  spreadBetween: (measure: string, from: number, fromScenario: string, to: number, toScenario: string) => string
  spreadSingle: (measure: string, year: number, scenario: string) => string
  spreadNone: (measure: string) => string
  notWithin: (scenarios: string, horizon: number) => string
  alreadyLate: string
  afterHorizon: (horizon: number) => string
  years: (n: number) => string
  tableHead: string[]
  measuresTitle: string
  measuresHead: (datum: string) => string[]
  noHeight: string
  kinds: Record<string, string>
  costs: Record<string, string>
  recordsTitle: string
  recordsNone: string
  recordsHead: string[]
  basis: (scenario: string, hash: string, releases: string) => string
  method: string
  cautionsTitle: string
  cautions: string[]
  chart: { today: string, late: string, decision: string, beyond: string }
  noOutlooks: string
  page: (page: number, pages: number) => string
}

export const PATHWAY_TEXT: Record<Language, PathwayText> = {
  en: {
    kind: 'Adaptation pathways',
    title: site => `Adaptation pathways: ${site}`,
    illustrative: 'Illustrative: invented demonstration content, not for decisions.',
    intro: 'Which measures, in what order, and by when each must be decided. A measure serves until its tipping year, the first year the chance of exceeding the height it protects to reaches the tolerance; the next measure must be decided its lead time earlier.',
    tolerance: percent => `Tolerance ${percent}`,
    spreadBetween: (measure, from, fromScenario, to, toScenario) => `Decide on ${measure} between ${from} (${fromScenario}) and ${to} (${toScenario}).`,
    spreadSingle: (measure, year, scenario) => `Decide on ${measure} by ${year} (${scenario}).`,
    spreadNone: measure => `${measure}: the measure before it does not tip within the outlook in any scenario.`,
    notWithin: (scenarios, horizon) => `In ${scenarios} the measure before it does not tip by ${horizon}.`,
    alreadyLate: 'already late',
    afterHorizon: horizon => `after ${horizon}`,
    years: n => (n === 1 ? '1 year' : `${n} years`),
    tableHead: ['Measure in service', 'Next measure', 'Scenario', 'Tipping year', 'Monte Carlo interval', 'Lead time of the next', 'Decision year'],
    measuresTitle: 'Measures',
    measuresHead: datum => ['Measure', `Protects to (m above ${datum})`, 'Compared with', 'Lead time', 'Design life', 'Cost band'],
    noHeight: 'no height (does not tip)',
    kinds: { 'mean-sea-level': 'Mean sea level', 'flood-level': 'Flood level (total water level)' },
    costs: { 'low': 'Low', 'medium': 'Medium', 'high': 'High', 'very-high': 'Very high' },
    recordsTitle: 'Decision records',
    recordsNone: 'No decisions recorded yet.',
    recordsHead: ['Decision', 'Scenario, tolerance', 'Tipping year', 'Decide by', 'Rationale', 'Recorded', 'Review by'],
    basis: (scenario, hash, releases) => `${scenario}: outlook ${hash}; releases ${releases}.`,
    method: 'Tipping years are counted year by year from each outlook\'s own trajectories; the Monte Carlo interval is the range of years whose chance lies within 1.96 standard errors of the tolerance, and reflects the number of trajectories, not the spread of the science. Flood levels are interpolated between the outlook\'s decades.',
    cautionsTitle: 'Before you rely on these years',
    cautions: [
      'Tipping and decision years are projections, not predictions: they depend on the scenario, the tolerance and the published science.',
      'Deep uncertainty in ice-sheet behaviour can bring them earlier than shown.',
      'Heights, lead times and costs are the planner\'s own. Follow local codes and standards and the advice of licensed coastal engineers.',
    ],
    chart: { today: 'Today', late: 'Decision year already past', decision: 'Decision year', beyond: 'beyond' },
    noOutlooks: 'This site has no finished outlook yet.',
    page: (page, pages) => `Page ${page} of ${pages}`,
  },
  es: {
    kind: 'Trayectorias de adaptación',
    title: site => `Trayectorias de adaptación: ${site}`,
    illustrative: 'Ilustrativo: contenido de demostración inventado, no apto para decidir.',
    intro: 'Qué medidas, en qué orden y para cuándo hay que decidir cada una. Una medida sirve hasta su año de inflexión, el primer año en que la probabilidad de superar la altura que protege alcanza la tolerancia; la medida siguiente debe decidirse con su plazo de ejecución de antelación.',
    tolerance: percent => `Tolerancia del ${percent}`,
    spreadBetween: (measure, from, fromScenario, to, toScenario) => `Decida sobre ${measure} entre ${from} (${fromScenario}) y ${to} (${toScenario}).`,
    spreadSingle: (measure, year, scenario) => `Decida sobre ${measure} antes de ${year} (${scenario}).`,
    spreadNone: measure => `${measure}: la medida anterior no llega a su inflexión dentro de la perspectiva en ningún escenario.`,
    notWithin: (scenarios, horizon) => `En ${scenarios} la medida anterior no llega a su inflexión antes de ${horizon}.`,
    alreadyLate: 'ya es tarde',
    afterHorizon: horizon => `después de ${horizon}`,
    years: n => (n === 1 ? '1 año' : `${n} años`),
    tableHead: ['Medida en servicio', 'Medida siguiente', 'Escenario', 'Año de inflexión', 'Intervalo Monte Carlo', 'Plazo de la siguiente', 'Año de decisión'],
    measuresTitle: 'Medidas',
    measuresHead: datum => ['Medida', `Protege hasta (m sobre ${datum})`, 'Se compara con', 'Plazo de ejecución', 'Vida útil de diseño', 'Franja de coste'],
    noHeight: 'sin altura (no llega a inflexión)',
    kinds: { 'mean-sea-level': 'Nivel medio del mar', 'flood-level': 'Cota de inundación (nivel total del agua)' },
    costs: { 'low': 'Bajo', 'medium': 'Medio', 'high': 'Alto', 'very-high': 'Muy alto' },
    recordsTitle: 'Registros de decisiones',
    recordsNone: 'Aún no hay decisiones registradas.',
    recordsHead: ['Decisión', 'Escenario, tolerancia', 'Año de inflexión', 'Decidir antes de', 'Justificación', 'Registrado', 'Revisar antes de'],
    basis: (scenario, hash, releases) => `${scenario}: perspectiva ${hash}; versiones ${releases}.`,
    method: 'Los años de inflexión se cuentan año a año a partir de las propias trayectorias de cada perspectiva; el intervalo Monte Carlo es el conjunto de años cuya probabilidad está a menos de 1,96 errores típicos de la tolerancia, y refleja el número de trayectorias, no la dispersión de la ciencia. Las cotas de inundación se interpolan entre las décadas de la perspectiva.',
    cautionsTitle: 'Antes de confiar en estos años',
    cautions: [
      'Los años de inflexión y de decisión son proyecciones, no predicciones: dependen del escenario, de la tolerancia y de la ciencia publicada.',
      'La incertidumbre profunda sobre el comportamiento de los mantos de hielo puede adelantarlos respecto a lo mostrado.',
      'Las alturas, los plazos y los costes son los del propio planificador. Siga las normas y códigos locales y el consejo de ingenieros costeros colegiados.',
    ],
    chart: { today: 'Hoy', late: 'Año de decisión ya pasado', decision: 'Año de decisión', beyond: 'más allá' },
    noOutlooks: 'Este sitio aún no tiene ninguna perspectiva terminada.',
    page: (page, pages) => `Página ${page} de ${pages}`,
  },
}
