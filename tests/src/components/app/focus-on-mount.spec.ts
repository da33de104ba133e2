// @vitest-environment happy-dom
// The sign-in page puts the caret in the e-mail field when it is mounted, not later: the text
// field's own autofocus waited for an IntersectionObserver callback that could arrive after the
// password field had the focus, and the password then went into the e-mail field (seen in a
// browser test on a busy machine).
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import { createMemoryHistory, createRouter } from 'vue-router'
import SignInView from '@/views/SignInView.vue'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

describe('focus on a page form', () => {
  it('is in the e-mail field as soon as the sign-in page is mounted, and stays where the user puts it', async () => {
    const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/:p(.*)*', component: { template: '<div />' } }] })
    await router.push('/sign-in')
    wrapper = mountWithApp(SignInView, { global: { plugins: [router] } })
    // no await before this check: the focus is set during the mount itself
    expect(document.activeElement?.getAttribute('name')).toBe('email')
    const password = wrapper.find<HTMLInputElement>('input[name="password"]').element
    password.focus()
    await settle()
    expect(document.activeElement).toBe(password)
  })
})
