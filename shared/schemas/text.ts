import { z } from 'zod'

// Free text is stored as typed (markup, SQL, right-to-left letters, zero-width joiners, emoji) and
// escaped wherever it is shown, with one exception made here, in the schemas every form and route
// share: characters nobody means to type. C0 and C1 control codes (BEL, ESC and the rest; tab, line
// feed and carriage return stay) and DEL would reach a PDF or an e-mail as raw codes, and the
// bidirectional embeddings, overrides and isolates (U+202A–U+202E, U+2066–U+2069) could make a
// name read backwards in a briefing. Right-to-left text needs none of them; the left-to-right and
// right-to-left marks (U+200E, U+200F) and the zero-width (non-)joiners (U+200C, U+200D) are kept.
// NUL is refused before any schema runs (readValidBody), since it cannot be stored at all.
// eslint-disable-next-line no-control-regex -- finding control characters is the point
export const CONTROL_CHARACTERS = /[\u0001-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F\u202A-\u202E\u2066-\u2069]/g

export const withoutControls = (text: string) => text.replace(CONTROL_CHARACTERS, '')

/** A string field with the control characters above removed; chain trim, min and max after it. */
export const textField = (params?: Parameters<typeof z.string>[0]) => z.string(params).overwrite(withoutControls)
