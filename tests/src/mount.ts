// Mounting helper for component tests: the app's own Vuetify set-up and a fresh Pinia per test.
import { mount, flushPromises, type ComponentMountingOptions } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import type { Component } from 'vue'
import { makeVuetify } from '@/plugins/vuetify.ts'

// happy-dom has no visualViewport; Vuetify's menus position themselves with it.
if (typeof window !== 'undefined' && !('visualViewport' in window)) {
  Object.defineProperty(window, 'visualViewport', {
    configurable: true,
    value: {
      width: 1024, height: 768, offsetLeft: 0, offsetTop: 0, pageLeft: 0, pageTop: 0, scale: 1,
      addEventListener() {}, removeEventListener() {},
    },
  })
}

// A component test never reaches the network: an API call the test did not mock fails here at
// once, as a refused connection would, instead of going to happy-dom's page address
// (127.0.0.1:3000), where whatever else runs on the machine might answer it.
if (typeof window !== 'undefined') {
  const refuse = (input: unknown) => Promise.reject(new TypeError(`no network in component tests (unmocked request to ${String(input instanceof Request ? input.url : input)})`))
  globalThis.fetch = refuse as typeof fetch
  window.fetch = refuse as typeof fetch
}

export function mountWithApp<C extends Component>(component: C, options: ComponentMountingOptions<C> = {}) {
  const pinia = createPinia()
  setActivePinia(pinia)
  return mount(component, {
    attachTo: document.body,
    ...options,
    // the test's own plugins (a router) come after the app's Pinia and Vuetify
    global: { ...(options.global ?? {}), plugins: [pinia, makeVuetify(), ...(options.global?.plugins ?? [])] },
  } as ComponentMountingOptions<C>)
}

/** Lets Vuetify's async validation and transitions settle. */
export async function settle(rounds = 4): Promise<void> {
  for (let i = 0; i < rounds; i++) {
    await flushPromises()
    await new Promise((resolve) => setTimeout(resolve, 0))
  }
}
