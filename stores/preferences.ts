import { defineStore } from 'pinia'
import { formatHeight, type HeightUnit } from '#shared/units'

// Client choices that span pages. Kept in cookies so the server renders the same units.
export const usePreferencesStore = defineStore('preferences', () => {
  const units = useCookie<HeightUnit>('brinkwater_units', {
    default: () => 'm',
    sameSite: 'lax',
    maxAge: 60 * 60 * 24 * 365,
  })
  const scenario = useCookie<string>('brinkwater_scenario', {
    default: () => 'SSP2-4.5',
    sameSite: 'lax',
    maxAge: 60 * 60 * 24 * 365,
  })
  const { locale } = useI18n()

  function setUnits(next: HeightUnit) {
    units.value = next
  }

  function setScenario(next: string) {
    scenario.value = next
  }

  /** A height in metres as the user wants to read it. */
  const height = (metres: number) => formatHeight(metres, units.value, locale.value)

  return { units, scenario, setUnits, setScenario, height }
})
