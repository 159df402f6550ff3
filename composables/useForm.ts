/**
 * Form state shared by every form: sending (to disable the button), the
 * message of a failed request, and the per-field messages the API sends in
 * `data.issues` (or that the shared zod schema finds before sending).
 */
import type { z } from 'zod'

interface ApiErrorData {
  message?: string
  data?: { issues?: { path: string, message: string }[] }
}

export function useForm() {
  const sending = ref(false)
  const error = ref('')
  const fieldErrors = ref<Record<string, string>>({})

  function reset() {
    error.value = ''
    fieldErrors.value = {}
  }

  /** Checks `values` with a shared schema; returns the parsed values or null with errors shown. */
  function check<S extends z.ZodType>(schema: S, values: unknown): z.infer<S> | null {
    reset()
    const parsed = schema.safeParse(values)
    if (parsed.success) return parsed.data
    for (const issue of parsed.error.issues) {
      const key = issue.path.map(String).join('.') || '_'
      fieldErrors.value[key] ??= issue.message
    }
    error.value = 'Check the highlighted fields'
    return null
  }

  /** Runs a request, keeping `sending` true meanwhile and turning its error into messages. */
  async function send<T>(request: () => Promise<T>): Promise<T | undefined> {
    reset()
    sending.value = true
    try {
      return await request()
    } catch (caught) {
      const answer = (caught as { data?: ApiErrorData }).data
      for (const issue of answer?.data?.issues ?? []) fieldErrors.value[issue.path] ??= issue.message
      error.value = answer?.message || 'The request failed; check your connection and try again'
      return undefined
    } finally {
      sending.value = false
    }
  }

  return { sending, error, fieldErrors, check, send, reset }
}
