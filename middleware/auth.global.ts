// Every page needs a signed-in user unless it declares `definePageMeta({ public: true })`.
export default defineNuxtRouteMiddleware((to) => {
  if (to.meta.public) return
  const session = useSessionStore()
  if (!session.signedIn) return navigateTo({ path: '/login', query: { next: to.fullPath } })
})
