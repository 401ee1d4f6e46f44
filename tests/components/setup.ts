// Nuxt auto-imports Vue's API, the router's composables, the stores and a few of its own helpers into every page,
// component and composable. These component tests run without Nuxt, so they put the same names on globalThis:
// the real Vue, vue-router and Pinia, and a session that a test sets through `signedInAs`.
import * as vue from 'vue'
import { useRoute, useRouter } from 'vue-router'
import { useFittingDraftsStore } from '~/stores/fittingDrafts'
import { useFittingUnitsStore } from '~/stores/fittingUnits'

const session = vue.ref<{ id: number, name: string, role: string } | null>(null)

/** The signed-in person that `useUserSession()` answers with. */
export function signedInAs(user: { id: number, name: string, role: string } | null) {
  session.value = user
}

const globals: Record<string, unknown> = {
  ...Object.fromEntries(['ref', 'computed', 'reactive', 'watch', 'watchEffect', 'readonly', 'shallowRef', 'toRef', 'toRefs', 'unref',
    'inject', 'provide', 'nextTick', 'onMounted', 'onBeforeUnmount', 'onUnmounted', 'useId', 'useTemplateRef', 'useSlots', 'useAttrs']
    .map(name => [name, (vue as Record<string, unknown>)[name]])),
  useRoute,
  useRouter,
  useFittingDraftsStore,
  useFittingUnitsStore,
  useUserSession: () => ({ user: session, loggedIn: vue.computed(() => !!session.value) }),
}
Object.assign(globalThis, globals)
