import { reactive, ref } from 'vue'
import { ApiError } from '../api/http'

export interface SplitError<F extends string> {
  fields: Partial<Record<F, string>>
  general: string | null
}

/**
 * Put a failure where the user will look: beside the input the server named in `field` (a zod path
 * such as "name" or "body.name"), otherwise above the form.
 */
export function splitApiError<F extends string>(err: unknown, fields: readonly F[]): SplitError<F> {
  if (!(err instanceof ApiError)) {
    return { fields: {}, general: err instanceof Error ? err.message : 'Something went wrong.' }
  }
  const named = err.field?.split('.').pop()
  const field = fields.find((f) => f === err.field || f === named)
  if (field) return { fields: { [field]: err.message } as Partial<Record<F, string>>, general: null }
  return { fields: {}, general: err.message }
}

/** Field and form errors for one form, fed by client checks and by ApiErrors from the server. */
export function useFormErrors<F extends string>(fields: readonly F[]) {
  const fieldErrors = reactive<Partial<Record<F, string>>>({}) as Partial<Record<F, string>>
  const general = ref<string | null>(null)

  function clear(): void {
    for (const f of fields) delete fieldErrors[f]
    general.value = null
  }

  /** Show errors found before sending; returns true when there were none. */
  function check(found: Partial<Record<F, string>>): boolean {
    clear()
    Object.assign(fieldErrors, found)
    return Object.keys(found).length === 0
  }

  function capture(err: unknown): void {
    clear()
    const split = splitApiError(err, fields)
    Object.assign(fieldErrors, split.fields)
    general.value = split.general
  }

  /** Props for an NFormItem: red outline and the message under the input. */
  function itemProps(field: F): { validationStatus?: 'error'; feedback?: string } {
    const message = fieldErrors[field]
    return message ? { validationStatus: 'error', feedback: message } : {}
  }

  return { fieldErrors, general, clear, check, capture, itemProps }
}
