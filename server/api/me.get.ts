/** Who is signed in (401 when nobody is). */
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return { user }
})
