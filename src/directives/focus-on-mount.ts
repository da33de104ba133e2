import type { Directive } from 'vue'

/**
 * `v-focus-on-mount`: puts the caret in the field as soon as the page shows it. The text fields'
 * own `autofocus` waits for an IntersectionObserver callback, which on a busy machine can arrive
 * after the user (or a browser test) has already moved on to the next field, and then pulls the
 * focus back mid-typing: a password typed straight after the e-mail ended up in the e-mail field.
 * For fields on a page; a dialog's fields keep `autofocus`, which waits until the dialog is shown.
 */
export const vFocusOnMount: Directive<HTMLElement> = {
  mounted(el) {
    const input = el.matches('input, textarea') ? el : el.querySelector<HTMLElement>('input, textarea')
    input?.focus()
  },
}
