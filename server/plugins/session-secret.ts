/**
 * nuxt-auth-utils only warns when the session password is missing in
 * production, and then every sign-in fails. Refuse to start instead, saying
 * what to set. (`npm start` and `npm run dev` pass one kept in .data/.)
 */
export default defineNitroPlugin(() => {
  if (import.meta.dev) return
  const password = useRuntimeConfig().session?.password ?? ''
  if (password.length < 32) {
    console.error(
      'Equipoise cannot start: set NUXT_SESSION_PASSWORD to a random secret of at least 32 characters '
      + '(for example: export NUXT_SESSION_PASSWORD=$(openssl rand -hex 32)).',
    )
    process.exit(1)
  }
})
