/**
 * The version of the Poise compiler, stored with every run beside the
 * compiled model it made.
 *
 * Bump it by hand (in the same commit) whenever the same text would compile
 * to a different model: a default changes (temperature, activity model, a
 * unit factor, atomic weights), a constant kind is converted differently, a
 * library is resolved differently, a field of the model is added, renamed or
 * given a new meaning. Minor for a new field or statement that old texts
 * cannot contain; major for anything that changes the model of an existing
 * text. Messages, completion and hover do not need a bump.
 */
export const COMPILER_VERSION = '1.4.1'
