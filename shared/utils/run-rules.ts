/**
 * Who may do what with stored runs. A stored run takes space in the lab's
 * run storage budget, so a viewer's Run is a preview that stores nothing;
 * reviewers and up store runs (the record of the answer they judged), and
 * editors and up delete them to free space.
 */
import type { LabRole } from './roles'

export const RUN_STORE_ROLE: LabRole = 'reviewer'
export const RUN_DELETE_ROLE: LabRole = 'editor'
