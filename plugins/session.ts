// Load the session before the first route middleware runs, so pages know
// whether someone is signed in during server rendering.
export default defineNuxtPlugin(async () => {
  const session = useSessionStore()
  if (!session.loaded) await session.refresh()
})
