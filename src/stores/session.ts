import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import * as auth from '@/api/auth.ts'
import { listDevMail } from '@/api/dev.ts'
import { ApiError } from '@/api/http.ts'
import type { Me, Role } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

const TEAM_KEY = 'starsway.team'

/** Who is signed in, their teams, and which team the screens show. */
export const useSessionStore = defineStore('session', () => {
  const me = asyncState<Me>()
  /** True once `me` was asked at least once (signed in or not). */
  const checked = ref(false)
  const storedTeam = Number(globalThis.localStorage?.getItem(TEAM_KEY) ?? NaN)
  const selectedTeamId = ref<number | null>(Number.isFinite(storedTeam) ? storedTeam : null)

  const user = computed(() => me.data?.user ?? null)
  const memberships = computed(() => me.data?.memberships ?? [])
  const currentTeam = computed(() => {
    const list = memberships.value
    return list.find((m) => m.teamId === selectedTeamId.value) ?? list[0] ?? null
  })
  const role = computed<Role | null>(() => currentTeam.value?.role ?? null)
  const canWrite = computed(() => role.value === 'owner' || role.value === 'analyst')
  const isOwner = computed(() => role.value === 'owner')

  function roleIn(teamId: number): Role | null {
    return memberships.value.find((m) => m.teamId === teamId)?.role ?? null
  }

  function selectTeam(teamId: number) {
    selectedTeamId.value = teamId
    globalThis.localStorage?.setItem(TEAM_KEY, String(teamId))
  }

  /** Asks the server who we are; a 401 means signed out and is not an error on screen. */
  async function load(): Promise<Me | null> {
    me.isLoading = true
    me.error = null
    try {
      me.data = await auth.fetchMe()
    } catch (error) {
      me.data = null
      if (!(error instanceof ApiError && error.status === 401)) me.error = (error as Error).message
    } finally {
      me.isLoading = false
      checked.value = true
    }
    return me.data
  }

  async function signIn(email: string, password: string) {
    await auth.signIn({ email, password })
    await load()
  }

  async function register(body: { email: string; password: string; name: string; inviteToken?: string }) {
    await auth.register(body)
    await load()
  }

  const signOutState = asyncState<void>()
  async function signOut() {
    await track(signOutState, () => auth.signOut())
    me.data = null
  }

  const passwordChange = asyncState<void>()
  /** Changes the signed-in user's password (the server ends their other sessions); the outcome in `passwordChange`. */
  async function changePassword(currentPassword: string, newPassword: string) {
    await track(passwordChange, () => auth.changePassword({ currentPassword, newPassword }))
  }

  /** Whether the server offers the development mail page (never in production): asked once. */
  const devMail = ref<boolean | null>(null)
  async function checkDevMail() {
    if (devMail.value !== null) return
    devMail.value = await listDevMail().then(() => true, () => false)
  }

  return {
    me, checked, user, memberships, currentTeam, role, canWrite, isOwner, selectedTeamId, signOutState, passwordChange, devMail,
    roleIn, selectTeam, load, signIn, register, signOut, changePassword, checkDevMail,
  }
})
