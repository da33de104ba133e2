// @vitest-environment happy-dom
// Issue 11, hole 10: reviewers see no write controls; the team page confirms a removal in its own
// dialog (not the browser's confirm); a successful invitation leaves a clean, not a red, e-mail field.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import { reactive } from 'vue'
import ModelEditor from '@/components/analysis/ModelEditor.vue'
import { planetForm, type ModelForm } from '@/components/analysis/model-form.ts'
import TeamView from '@/views/TeamView.vue'
import * as api from '@/api/teams.ts'
import { useSessionStore } from '@/stores/session.ts'
import { mountWithApp, settle } from '../../mount.ts'

vi.mock('@/api/teams.ts', () => ({
  fetchTeam: vi.fn(), listInvitations: vi.fn(), createInvitation: vi.fn(), removeMember: vi.fn(),
  changeMemberRole: vi.fn(), deleteInvitation: vi.fn(), approveInvitation: vi.fn(),
}))

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

describe('write controls by role', () => {
  const form = () => reactive({ name: 'm', trend: 'none', instruments: ['Harrier'], planets: [planetForm(12.4, 9, 0)] }) as ModelForm

  it('a reviewer (disabled editor) sees no Fit, Add-planet or Remove buttons', async () => {
    wrapper = mountWithApp(ModelEditor, { props: { form: form(), instruments: ['Harrier'], disabled: true } })
    await settle()
    for (const id of ['fit', 'add-planet-blank', 'remove-planet-0', 'fit-as-new']) expect(wrapper.find(`[data-test="${id}"]`).exists(), id).toBe(false)
  })

  it('an analyst sees them', async () => {
    wrapper = mountWithApp(ModelEditor, { props: { form: form(), instruments: ['Harrier'] } })
    await settle()
    for (const id of ['fit', 'add-planet-blank', 'remove-planet-0']) expect(wrapper.find(`[data-test="${id}"]`).exists(), id).toBe(true)
  })
})

describe('team page', () => {
  const team = {
    id: 7, name: 'Lanternfield', role: 'owner' as const,
    members: [
      { userId: 1, name: 'Nadia', email: 'n@x.test', role: 'owner' as const, joinedAt: '2026-01-01T00:00:00Z' },
      { userId: 2, name: 'Tomas', email: 't@x.test', role: 'analyst' as const, joinedAt: '2026-01-01T00:00:00Z' },
    ],
  }
  beforeEach(() => {
    vi.mocked(api.fetchTeam).mockResolvedValue(team)
    vi.mocked(api.listInvitations).mockResolvedValue([])
    vi.mocked(api.removeMember).mockResolvedValue(undefined)
    vi.mocked(api.createInvitation).mockResolvedValue({ id: 1, email: 'new@x.test', role: 'analyst', expiresAt: '2026-12-09T00:00:00Z', acceptedAt: null, pendingApproval: false })
  })

  async function mountTeam() {
    wrapper = mountWithApp(TeamView)
    const session = useSessionStore()
    session.me.data = { user: { id: 1, email: 'n@x.test', name: 'Nadia' }, memberships: [{ teamId: 7, teamName: 'Lanternfield', role: 'owner' }] }
    await settle()
    return wrapper
  }

  it('removing a member asks in the app\'s dialog, never window.confirm', async () => {
    const confirm = vi.fn(() => true)
    vi.stubGlobal('confirm', confirm)
    const w = await mountTeam()
    await w.find('[data-test="remove-member-2"]').trigger('click')
    await settle()
    expect(confirm).not.toHaveBeenCalled()
    expect(document.body.querySelector('[data-test="remove-member-dialog"]')?.textContent).toContain('Remove Tomas from the team?')
    expect(api.removeMember).not.toHaveBeenCalled()
    ;(document.body.querySelector('[data-test="remove-member-confirm"]') as HTMLElement).click()
    await settle()
    expect(api.removeMember).toHaveBeenCalledWith(7, 2)
    vi.unstubAllGlobals()
  })

  it('after a successful invitation the e-mail field is empty and not marked "Required"', async () => {
    const w = await mountTeam()
    const field = w.find('input[type="email"]')
    await field.setValue('new@x.test')
    await settle()
    await w.find('form').trigger('submit')
    await settle(8)
    expect(api.createInvitation).toHaveBeenCalledWith(7, { email: 'new@x.test', role: 'analyst' })
    expect((field.element as HTMLInputElement).value).toBe('')
    expect(w.text()).toContain('Invitation sent to new@x.test.')
    expect(w.text()).not.toContain('Required')
  })
})
