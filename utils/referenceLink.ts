/** Where the language reference lives (pages/reference.vue), and its address at a statement. */
export const REFERENCE_PATH = '/reference'

/** The address of the reference at a statement keyword (`component` → `/reference#component`), or at its top for anything else. */
export function referenceLink(keyword: string | null | undefined): string {
  return keyword && /^[a-z][a-z-]*$/.test(keyword) ? `${REFERENCE_PATH}#${keyword}` : REFERENCE_PATH
}
