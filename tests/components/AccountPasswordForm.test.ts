import { describe, expect, it, vi } from 'vitest'
import { FetchError } from 'ofetch'
import { flushPromises } from '@vue/test-utils'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import AccountPasswordForm from '~/components/account/AccountPasswordForm.vue'

/** A refusal as $fetch throws it. */
function refusal(statusCode: number, message: string) {
  return Object.assign(new FetchError(message), {
    statusCode,
    data: { message },
    response: new Response(null, { status: statusCode }),
  })
}

async function mountForm(send: (password: string) => Promise<unknown>) {
  return mountSuspended(AccountPasswordForm, {
    props: { words: 'account.reset' as const, send },
  })
}

async function fill(form: Awaited<ReturnType<typeof mountForm>>, password: string, again = password) {
  await form.find('#new-password').setValue(password)
  await form.find('#new-password-again').setValue(again)
  await form.find('form').trigger('submit')
  await flushPromises()
}

const GOOD = 'tidal-harbour-wall-1998'

describe('AccountPasswordForm', () => {
  it('sends a password that passes the checks, once, and says it is done', async () => {
    const send = vi.fn(async () => {})
    const form = await mountForm(send)
    // The reset page's words (locales/en/mail.json, account.reset).
    expect(form.find('button').text()).toBe('Save the new password')
    expect(form.text()).toContain('The link works once.')
    await fill(form, GOOD)
    expect(send).toHaveBeenCalledExactlyOnceWith(GOOD)
    expect(form.emitted('done')).toHaveLength(1)
    expect(form.find('[role="alert"]').exists()).toBe(false)
  })

  it('says what to fix before sending a short or mistyped password', async () => {
    const send = vi.fn(async () => {})
    const form = await mountForm(send)
    await fill(form, 'short')
    expect(form.find('[role="alert"]').text()).toBe('Use at least 12 characters.')
    await fill(form, GOOD, `${GOOD}x`)
    expect(form.find('[role="alert"]').text()).toBe('The two passwords are not the same. Type them again.')
    expect(send).not.toHaveBeenCalled()
  })

  it('hands a used or expired link to the page, and keeps other refusals in the form', async () => {
    const used = await mountForm(async () => { throw refusal(404, 'No such reset link.') })
    await fill(used, GOOD)
    expect(used.emitted('gone')).toEqual([['This link has already been used or is not valid.']])

    const expired = await mountForm(async () => { throw refusal(410, 'Expired.') })
    await fill(expired, GOOD)
    expect(expired.emitted('gone')).toEqual([['This link has expired.']])

    const weak = await mountForm(async () => { throw refusal(400, 'password: Choose a less common password.') })
    await fill(weak, GOOD)
    expect(weak.emitted('gone')).toBeUndefined()
    expect(weak.find('[role="alert"]').text()).toContain('Choose a less common password.')
  })
})
