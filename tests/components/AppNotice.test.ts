import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import AppNotice from '~/components/app/AppNotice.vue'

describe('AppNotice', () => {
  it('announces what was done as a status, with the attributes the page gives it', async () => {
    const notice = await mountSuspended(AppNotice, {
      props: { message: 'Published.' },
      attrs: { 'data-testid': 'release-notice', 'class': 'mt-4' },
    })
    const text = notice.find('[role="status"]')
    expect(text.text()).toBe('Published.')
    expect(text.attributes('data-testid')).toBe('release-notice')
    expect(text.classes()).toContain('mt-4')
  })

  it('renders nothing while there is nothing to say, and appears once the message is set', async () => {
    const notice = await mountSuspended(AppNotice, { props: { message: '' } })
    expect(notice.find('[role="status"]').exists()).toBe(false)
    await notice.setProps({ message: 'Withdrawn.' })
    expect(notice.find('[role="status"]').text()).toBe('Withdrawn.')
  })

  it('takes richer content from its slot', async () => {
    const notice = await mountSuspended(AppNotice, { slots: { default: () => 'Saved at 10:04.' } })
    expect(notice.find('[role="status"]').text()).toBe('Saved at 10:04.')
  })
})
