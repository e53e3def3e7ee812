import { describe, expect, it } from 'vitest'
import { h } from 'vue'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import AppDataTable from '~/components/app/AppDataTable.vue'

interface Harbour { id: string, name: string, berths: number }
const HARBOURS: Harbour[] = [{ id: 'a', name: 'Kelwick', berths: 12 }, { id: 'b', name: 'Drumhaven', berths: 4 }]
const COLUMNS = [
  { key: 'name', header: 'Harbour', rowHeader: true },
  { key: 'berths', header: 'Berths', sort: 'descending' as const },
]

function mountTable(props: Partial<{ rows: Harbour[], empty: string, captionVisible: boolean }> = {}, slots = {}) {
  return mountSuspended(AppDataTable, {
    props: {
      caption: 'Harbours of Caldwyn',
      columns: COLUMNS,
      rows: HARBOURS,
      rowKey: (row: unknown) => (row as Harbour).id,
      testid: 'harbours',
      rowAttrs: (row: unknown) => ({ 'data-testid': `harbour-${(row as Harbour).name}` }),
      ...props,
    },
    slots,
  })
}

describe('AppDataTable', () => {
  it('names its rows and columns for assistive technology', async () => {
    const table = await mountTable()
    expect(table.find('caption').text()).toBe('Harbours of Caldwyn')
    expect(table.find('caption').classes()).toContain('sr-only')
    expect(table.findAll('thead th').map(th => [th.attributes('scope'), th.text()])).toEqual([
      ['col', 'Harbour'],
      ['col', 'Berths'],
    ])
    expect(table.findAll('thead th')[1]!.attributes('aria-sort')).toBe('descending')
    expect(table.findAll('tbody th').map(th => [th.attributes('scope'), th.text()])).toEqual([
      ['row', 'Kelwick'],
      ['row', 'Drumhaven'],
    ])
    expect(table.findAll('tbody td').map(td => td.text())).toEqual(['12', '4'])
  })

  it('scrolls in a region a keyboard can reach, named by the caption', async () => {
    const table = await mountTable({ captionVisible: true })
    const region = table.find('[role="region"]')
    expect(region.attributes('tabindex')).toBe('0')
    expect(region.attributes('aria-label')).toBe('Harbours of Caldwyn')
    expect(table.find('caption').classes()).not.toContain('sr-only')
  })

  it('keeps the test ids the browser tests find rows by', async () => {
    const table = await mountTable()
    expect(table.find('table').attributes('data-testid')).toBe('harbours')
    expect(table.find('[data-testid="harbour-Drumhaven"] th').text()).toBe('Drumhaven')
  })

  it('lets the page lay out a cell and a header', async () => {
    const table = await mountTable({}, {
      'cell-berths': ({ row }: { row: Harbour }) => h('strong', `${row.berths} berths`),
      'header-name': () => h('button', 'Sort by harbour'),
    })
    expect(table.findAll('tbody strong').map(cell => cell.text())).toEqual(['12 berths', '4 berths'])
    expect(table.find('thead button').text()).toBe('Sort by harbour')
  })

  it('says there is nothing across all columns, and only when told what to say', async () => {
    const told = await mountTable({ rows: [], empty: 'No harbours yet.' })
    const cell = told.find('tbody td')
    expect(cell.text()).toBe('No harbours yet.')
    expect(cell.attributes('colspan')).toBe('2')
    const silent = await mountTable({ rows: [] })
    expect(silent.findAll('tbody tr')).toHaveLength(0)
  })
})
