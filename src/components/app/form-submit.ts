// A Vuetify form's submit event is also a promise that settles once every field's rules have run.
// The form's `v-model` validity lags a quick click or an Enter straight after autofill, so a submit
// handler that reads it can drop the user's first press without a word; await the event instead.

/** True when every rule of the submitted form passed. */
export async function submittedValid(event: Event): Promise<boolean> {
  const result = await (event as unknown as PromiseLike<{ valid: boolean }>)
  return result.valid
}
