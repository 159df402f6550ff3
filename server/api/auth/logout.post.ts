/** Signs this browser out for good: the session's row goes, so a copy of the cookie is refused afterwards. */
export default defineEventHandler(async (event) => {
  await endSession(event)
  return { signedOut: true }
})
