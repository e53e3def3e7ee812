import { describe, expect, it } from 'vitest'
import { defineComponent, h, ref } from 'vue'
import { FetchError } from 'ofetch'
import { flushPromises } from '@vue/test-utils'
import { mountSuspended } from '@nuxt/test-utils/runtime'

/** A refusal as $fetch throws it: the API's message and its field issues. */
function refusal(message: string, issues: { field: string, message: string }[] = []) {
  const failure = new FetchError(message)
  Object.assign(failure, {
    statusCode: 400,
    data: { message, data: { issues } },
    response: new Response(null, { status: 400 }),
  })
  return failure
}

/** A request the test settles by hand. */
function pending() {
  let settle!: { resolve: () => void, reject: (reason: unknown) => void }
  const promise = new Promise<void>((resolve, reject) => { settle = { resolve, reject } })
  return { promise, ...settle }
}

// A small form as the app writes them: useSubmit for its state, useFieldIssues for the messages beside the field.
const TitleForm = defineComponent({
  props: { send: { type: Function, required: true } },
  setup(props) {
    const title = ref('')
    const submission = useSubmit()
    const { error, working, done, run, fail } = submission
    const { shown, summary } = useFieldIssues(
      submission,
      () => ({ title: title.value }),
      field => (field === 'title' ? 'Title' : ''),
    )
    async function submit() {
      if (title.value === 'draft') return fail('Give the briefing a real title.')
      await run(() => props.send(title.value))
    }
    return () =>
      h(
        'form',
        {
          onSubmit: (event: Event) => {
            event.preventDefault()
            void submit()
          },
        },
        [
          summary.value || error.value ? h('p', { role: 'alert' }, summary.value || error.value) : null,
          h('input', {
            value: title.value,
            onInput: (event: Event) => {
              title.value = (event.target as HTMLInputElement).value
            },
          }),
          h(
            'ul',
            { 'data-testid': 'field-messages' },
            shown.value.map(issue => h('li', `${issue.label}: ${issue.message}`)),
          ),
          done.value ? h('p', { role: 'status' }, 'Saved.') : null,
          h('button', { type: 'submit', disabled: working.value }, working.value ? 'Saving…' : 'Save'),
        ],
      )
  },
})

describe('useSubmit with useFieldIssues', () => {
  it('shows the working label while the request runs, then says it was saved', async () => {
    const request = pending()
    const form = await mountSuspended(TitleForm, { props: { send: () => request.promise } })
    await form.find('form').trigger('submit')
    expect(form.find('button').text()).toBe('Saving…')
    expect(form.find('button').attributes('disabled')).toBeDefined()
    request.resolve()
    await flushPromises()
    expect(form.find('button').text()).toBe('Save')
    expect(form.find('[role="status"]').text()).toBe('Saved.')
    expect(form.find('[role="alert"]').exists()).toBe(false)
  })

  it('shows the API message, puts field issues beside their field, and drops them once the field changes', async () => {
    const form = await mountSuspended(TitleForm, {
      props: {
        send: () =>
          Promise.reject(refusal('title: Too long', [{ field: 'title', message: 'Use at most 160 characters.' }])),
      },
    })
    await form.find('input').setValue('x'.repeat(200))
    await form.find('form').trigger('submit')
    await flushPromises()
    expect(form.findAll('[data-testid="field-messages"] li').map(li => li.text())).toEqual([
      'Title: Use at most 160 characters.',
    ])
    expect(form.find('[role="alert"]').exists()).toBe(true)
    expect(form.find('[role="status"]').exists()).toBe(false)
    await form.find('input').setValue('Quay Street defences')
    expect(form.findAll('[data-testid="field-messages"] li')).toHaveLength(0)
  })

  it('shows the message of a check made before sending, and sends nothing', async () => {
    let sent = 0
    const form = await mountSuspended(TitleForm, { props: { send: async () => { sent++ } } })
    await form.find('input').setValue('draft')
    await form.find('form').trigger('submit')
    await flushPromises()
    expect(form.find('[role="alert"]').text()).toBe('Give the briefing a real title.')
    expect(sent).toBe(0)
  })

  it('lets only the latest request speak: an earlier refusal arriving late is dropped', async () => {
    const first = pending()
    const second = pending()
    const requests = [first, second]
    const form = await mountSuspended(TitleForm, { props: { send: () => requests.shift()!.promise } })
    await form.find('form').trigger('submit')
    await form.find('form').trigger('submit')
    second.resolve()
    await flushPromises()
    first.reject(refusal('Too late to matter'))
    await flushPromises()
    expect(form.find('[role="alert"]').exists()).toBe(false)
    expect(form.find('[role="status"]').text()).toBe('Saved.')
    expect(form.find('button').text()).toBe('Save')
  })
})
